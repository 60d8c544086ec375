"""framesweep: checks the members of an analysed steel frame to EN 1993-1-1.

The package holds the stages of the pipeline (see DEVELOPERS.md): the frame and results data model,
sections and materials, the graph layer, stability, the clause functions, the checker and the
reports.
"""

__version__ = "0.1.0"

CAUTION = (
    "framesweep supports, and does not replace, the judgement of a qualified structural engineer. "
    "National annexes and local codes govern over the recommended values used here by default. "
    "The user is responsible for checking the inputs, the analysis model and the results."
)
