# Type hints of the overshoot module (docs/python.md). Matrices are n x n
# NumPy arrays indexed [row, column] in the order of `names`.
from fractions import Fraction
from os import PathLike
from typing import Any, Callable, Iterable, Optional, Sequence, Union

import numpy as np
import numpy.typing as npt

__version__: str

class LimitError(ValueError):
    """A well-formed input that would exceed a documented resource limit."""

class Option:
    name: str
    spec: str
    denominator: int
    weights: list[int]
    min_move: int
    max_move: int
    mean: float
    def __init__(self, spec: str, name: Optional[str] = None) -> None: ...
    def probability(self, move: int) -> Fraction: ...

Jump = Union[str, tuple[int, int]]

class Board:
    length: int
    overshoot: str
    jumps: list[tuple[int, int]]
    def __init__(self, length: int, overshoot: str = "stay", jumps: Iterable[Jump] = ()) -> None: ...

class Setup:
    board: Board
    order: str
    options: list[Option]

OptionLike = Union[str, Option]
FloatArray = npt.NDArray[np.float64]

def setup(*options: OptionLike, length: Optional[int] = None, overshoot: Optional[str] = None,
          jumps: Optional[Iterable[Jump]] = None, order: Optional[str] = None,
          scenario: Optional[Union[str, PathLike[str]]] = None, board: Optional[Board] = None) -> Setup: ...
def set_memory_limit(mib: int) -> None: ...
def memory_limit() -> int: ...

class ProfileResult:
    names: list[str]
    board: Board
    p_finish: FloatArray
    p_stuck: FloatArray
    mean_turns_given_finish: FloatArray
    sd_turns_given_finish: FloatArray
    quantiles: list[dict[float, Optional[int]]]
    stuck_squares: list[list[int]]
    def to_dict(self) -> dict[str, Any]: ...

def profile(*options: OptionLike, quantiles: Sequence[float] = (), length: Optional[int] = None,
            overshoot: Optional[str] = None, jumps: Optional[Iterable[Jump]] = None, order: Optional[str] = None,
            scenario: Optional[str] = None, board: Optional[Board] = None) -> ProfileResult: ...

class ExactDuel:
    p_a_wins: Fraction
    p_b_wins: Fraction
    p_tie: Fraction
    p_neither: Fraction
    margin: Fraction
    method: str

class DuelResult:
    a: Option
    b: Option
    board: Board
    order: str
    p_a_wins: float
    p_b_wins: float
    p_tie: float
    p_neither: float
    margin: float
    error_bound: float
    probability_error_bound: float
    bound_proven: bool
    target_met: bool
    method: str
    mean_rounds: Optional[float]
    median_rounds: Optional[int]
    a_beats_b: bool
    b_beats_a: bool
    exact: Optional[ExactDuel]
    def to_dict(self) -> dict[str, Any]: ...

def duel(a: OptionLike, b: OptionLike, *, exact: bool = False, method: str = "auto",
         length: Optional[int] = None, overshoot: Optional[str] = None, jumps: Optional[Iterable[Jump]] = None,
         order: Optional[str] = None, scenario: Optional[str] = None, board: Optional[Board] = None) -> DuelResult: ...

class Cycle:
    options: list[int]
    strength: float

class TournamentResult:
    names: list[str]
    win: FloatArray
    tie: FloatArray
    neither: FloatArray
    margin: FloatArray
    bound: FloatArray
    beats: npt.NDArray[np.bool_]
    copeland: FloatArray
    condorcet_winner: Optional[int]
    condorcet_loser: Optional[int]
    top_cycle: list[int]
    components: list[list[int]]
    undecided: list[tuple[int, int]]
    transitive: bool
    cycles: list[Cycle]
    strongest_cycle: Optional[Cycle]
    equilibrium: FloatArray
    exact_win: Optional[list[list[Optional[Fraction]]]]
    exact_margin: Optional[list[list[Optional[Fraction]]]]
    def to_dict(self) -> dict[str, Any]: ...

def tournament(*options: OptionLike, exact: bool = False, method: str = "auto", threads: int = 0,
               max_cycle_length: int = 6, cycle_cap: int = 10000, length: Optional[int] = None,
               overshoot: Optional[str] = None, jumps: Optional[Iterable[Jump]] = None, order: Optional[str] = None,
               scenario: Optional[str] = None, board: Optional[Board] = None) -> TournamentResult: ...
