"""Check families: each turns member rows into CheckBlocks by calling the clause functions of
`postproc.ec3`. The checker runs every registered family (see `postproc.checker.CHECK_FAMILIES`)."""
