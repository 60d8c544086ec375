"""The model: what the rest of the run reads.

`frame` (nodes, elements, sections, ties), `results` (forces, displacements, combinations and the
sign convention), `members` (design members, the graph layer), `rows` (MemberRows, CheckBlock and
the status vocabulary), `member_rows` (element forces to padded member arrays), `outcome`
(the checked result a report reads).
"""
