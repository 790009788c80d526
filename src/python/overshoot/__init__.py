"""overshoot: exact analysis of race games where the finish must be hit exactly.

The library behind the ``overshoot`` command line, for notebooks and programs
(docs/python.md). Every analysis takes options as spec strings ("2d6",
"[1,2,6]"), names from a scenario file or :class:`Option` objects, and the
board as keywords (``length=``, ``overshoot=``, ``jumps=``, ``order=``,
``scenario=``) or ``board=Board(...)``. Results are objects with attributes;
``to_dict()`` gives the command line's ``--json`` document. Bad input raises
ValueError with the command line's message; a resource limit raises
:class:`LimitError` (a ValueError of its own type).
"""

from ._core import *  # noqa: F401,F403
from ._core import __version__, LimitError  # noqa: F401
