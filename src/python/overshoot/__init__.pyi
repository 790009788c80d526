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

class RaceResult:
    names: list[str]
    p_wins: FloatArray
    p_shares: FloatArray
    p_tie: float
    p_neither: float
    probability_error_bound: float
    target_met: bool
    method: str
    def to_dict(self) -> dict[str, Any]: ...

def race(*options: OptionLike, order: str = "simultaneous", starts: Sequence[int] = (), length: Optional[int] = None,
         overshoot: Optional[str] = None, jumps: Optional[Iterable[Jump]] = None, scenario: Optional[str] = None,
         board: Optional[Board] = None) -> RaceResult: ...

class ClaimFailure(Exception):
    """The claim does not hold (or is undecided at the proven bounds): no certificate."""

class Certificate:
    kind: str
    options: list[str]
    statement: str
    board: Board
    margins: list[tuple[str, str, int, Optional[Fraction], float, float]]
    def to_dict(self) -> dict[str, Any]: ...
    def text(self, format: str = "json") -> str: ...
    def write(self, path: str, format: str = "json") -> None: ...

def certify(kind: str, *options: OptionLike, at: Optional[int] = None, threads: int = 0, residual: bool = False,
            length: Optional[int] = None, overshoot: Optional[str] = None, jumps: Optional[Iterable[Jump]] = None,
            order: Optional[str] = None, scenario: Optional[str] = None, board: Optional[Board] = None) -> Certificate: ...

class CheckReport:
    holds: bool
    failure: str
    passed: list[tuple[str, str]]
    primes: list[int]
    def __bool__(self) -> bool: ...
    def to_dict(self) -> dict[str, Any]: ...

def check(path: str, threads: int = 0) -> CheckReport: ...

Lengths = Union[tuple[int, int], str, int, range]
Variants = Optional[Iterable[tuple[str, str]]]

class VariantSweep:
    overshoot: str
    order: str
    lengths: npt.NDArray[np.int32]
    pairs: list[tuple[int, int]]
    margin: FloatArray       # [pair, length]
    error_bound: FloatArray  # [pair, length]
    p_a_wins: FloatArray
    p_b_wins: FloatArray
    p_tie: FloatArray
    condorcet_winner: npt.NDArray[np.int64]  # per length, -1 for none
    crossovers: list[dict[str, Any]]
    cycles: list[dict[str, Any]]
    no_dominant: list[tuple[int, int]]

class SweepResult:
    names: list[str]
    lengths: npt.NDArray[np.int32]
    variants: list[VariantSweep]
    def margin(self, a: Union[str, int], b: Union[str, int], variant: int = 0) -> FloatArray: ...
    def to_dict(self) -> dict[str, Any]: ...

def sweep(*options: OptionLike, lengths: Lengths, step: int = 1, variants: Variants = None, anchor: str = "start",
          method: str = "auto", threads: int = 0, max_cycle_length: int = 6, overshoot: Optional[str] = None,
          jumps: Optional[Iterable[Jump]] = None, order: Optional[str] = None,
          scenario: Optional[str] = None) -> SweepResult: ...

class HuntResult:
    names: list[str]
    complete: bool
    pairs_total: int
    pairs_known: int
    distinct: int
    cycles_found: int
    cycles: list[dict[str, Any]]
    def to_dict(self) -> dict[str, Any]: ...

def hunt(*families: str, lengths: Lengths, step: int = 1, variants: Variants = None, cycle_length: int = 3,
         min_strength: float = 0.0, require: Optional[str] = None, list: int = 100, method: str = "auto",
         threads: int = 0, checkpoint: Optional[str] = None, resume: bool = False,
         progress: Optional[Callable[[int, int], None]] = None) -> HuntResult: ...
