"""Distributions of uncertain inputs: what a project or a distributions file states.

A distributions table names parameter paths (as ``carbonledger params`` lists them) and factor
ids (in the factor's own unit, as its row states it), each with one distribution:

```toml
[uncertainty]                       # in the project file, or the top level of a --distributions file
sampling = "latin_hypercube"        # or "random" (default)

[uncertainty.parameters."natural_gas.methane_emission_share"]
distribution = "lognormal"          # median and geometric standard deviation (gsd > 1)
median = 0.005
gsd = 1.6

[uncertainty.parameters."reforming.natural_gas_gj_per_kg_h2"]
distribution = "triangular"
low = 0.152
mode = 0.158
high = 0.170

[uncertainty.factors."electricity.grid.eu27_2018"]
distribution = "normal"
mean = 300
sd = 30

[uncertainty.factors."natural_gas.upstream_co2"]   # no stated range: pedigree-matrix default
distribution = "pedigree"           # lognormal, median = the factor's value (or `median`)
scores = [2, 3, 1, 2, 4]            # reliability, completeness, temporal, geographical, further technological
basic_gsd = 1.05                    # optional basic uncertainty (default 1: none)

[uncertainty.parameters."electricity.sources.grid.factor"]   # a choice between factor ids
distribution = "discrete"
values = ["electricity.grid.eu27_2018", "electricity.grid.de_2022"]
weights = [0.7, 0.3]

[[uncertainty.correlations]]        # Spearman rank correlation of two inputs that move together
inputs = ["reforming.natural_gas_gj_per_kg_h2", "reforming.electricity_kwh_per_kg_h2"]
rank = 0.6
```

Each distribution turns a uniform draw u in (0, 1) into a value (its quantile function), so
random, Latin hypercube and rank-correlated sampling share one transform.

References
----------
.. [1] Limpert, E., Stahel, W. A. and Abbt, M. (2001). Log-normal distributions across the
   sciences: keys and clues. BioScience 51(5), 341-352 (median and geometric standard deviation).
.. [2] Iman, R. L. and Conover, W. J. (1982). A distribution-free approach to inducing rank
   correlation among input variables. Communications in Statistics B 11(3), 311-334.
.. [3] Weidema, B. P. et al. (2013). Overview and methodology. Data quality guideline for the
   ecoinvent database version 3. Ecoinvent Report 1 (v3) (pedigree matrix; see model/pedigree.py).
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Annotated, Literal, Union

import numpy as np
from pydantic import BaseModel, ConfigDict, Field, ValidationError, computed_field, field_validator, model_validator

from ..errors import InputError
from .factors import factors_root
from .input_files import read_input_bytes
from .pedigree import parse_scores, pedigree_gsd, pedigree_table
from .project import MAX_PROJECT_BYTES, loads_toml

SAMPLINGS = ("random", "latin_hypercube")
KINDS = ("normal", "lognormal", "triangular", "uniform", "discrete", "pedigree")


MAX_MAGNITUDE = 1e15  # larger than any parameter or factor in its own unit; beyond it draws overflow in products


def numbers_only(value, field: str, text_allowed: bool = False):
    """Refuse a truth value, or text, where a number is written (TOML's ``true`` is not 1, ``"0.5"`` is
    text); ``nan`` and ``inf`` are refused by the models (``allow_inf_nan=False``), as in a project file."""
    for item in value if isinstance(value, list) else [value]:
        if isinstance(item, bool) or (isinstance(item, str) and not text_allowed):
            kind = "a truth value" if isinstance(item, bool) else "text"
            raise ValueError(f"a number, got {item!r} ({kind})")
        if isinstance(item, float) and not math.isfinite(item):
            raise ValueError(f"a finite number (no nan or inf), got {item!r}")
        if isinstance(item, (int, float)) and abs(item) > MAX_MAGNITUDE:
            raise ValueError(f"a number of magnitude at most {MAX_MAGNITUDE:g}, got {item:g}")
    return value


class _Distribution(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)

    @field_validator(
        "mean",
        "sd",
        "median",
        "gsd",
        "low",
        "mode",
        "high",
        "basic_gsd",
        "values",
        "weights",
        mode="before",
        check_fields=False,
    )
    @classmethod
    def _numbers_are_numbers(cls, value, info):
        return numbers_only(value, info.field_name, text_allowed=info.field_name == "values")

    def numeric_values(self) -> bool:
        return True


class Normal(_Distribution):
    """Normal distribution: mean and standard deviation (sd >= 0)."""

    distribution: Literal["normal"]
    mean: float
    sd: float = Field(ge=0, description="standard deviation")

    def quantile(self, u: np.ndarray) -> np.ndarray:
        from scipy.special import ndtri

        return self.mean + self.sd * ndtri(u)

    def central(self) -> float:
        return self.mean


class Lognormal(_Distribution):
    """Lognormal distribution: median (geometric mean, > 0) and geometric standard deviation (>= 1)."""

    distribution: Literal["lognormal"]
    median: float = Field(gt=0)
    gsd: float = Field(ge=1, description="geometric standard deviation")

    def quantile(self, u: np.ndarray) -> np.ndarray:
        from scipy.special import ndtri

        return self.median * np.exp(np.log(self.gsd) * ndtri(u))

    def central(self) -> float:
        return self.median


class Pedigree(_Distribution):
    """Lognormal from pedigree-matrix scores (ecoinvent v3): median the value itself (or ``median``),
    geometric standard deviation from the five scores and the basic uncertainty (model/pedigree.py)."""

    distribution: Literal["pedigree"]
    scores: tuple[int, int, int, int, int]
    basic_gsd: float = Field(default=1.0, ge=1, description="basic uncertainty, a geometric standard deviation")
    median: float | None = Field(default=None, gt=0, description="default: the parameter's or factor's own value")
    stated_in: str = Field(default="", exclude=True)  # where the scores were written (a factor row's file)
    # why a default distribution was given (a row's scores, its grade); empty when stated
    basis: str = Field(default="", exclude=True)

    @field_validator("scores", mode="before")
    @classmethod
    def _scores(cls, value):
        try:
            return parse_scores(value, "", "scores")
        except InputError as error:
            raise ValueError(error.expected) from None

    @computed_field
    @property
    def gsd(self) -> float:
        return pedigree_gsd(self.scores, pedigree_table(factors_root()), self.basic_gsd)

    @computed_field
    @property
    def from_memory(self) -> bool:
        """True while the variance table is recorded from memory (outputs show the flag)."""
        return pedigree_table(factors_root()).from_memory

    def with_median(self, value: float) -> Pedigree:
        return self if self.median is not None else self.model_copy(update={"median": value})

    def quantile(self, u: np.ndarray) -> np.ndarray:
        from scipy.special import ndtri

        if self.median is None:
            raise ValueError("a pedigree distribution needs its median (the value it describes) before drawing")
        return self.median * np.exp(np.log(self.gsd) * ndtri(u))

    def central(self) -> float:
        return self.median


class Triangular(_Distribution):
    """Triangular distribution: low <= mode <= high, low < high."""

    distribution: Literal["triangular"]
    low: float
    mode: float
    high: float

    @model_validator(mode="after")
    def _mode_within(self):
        if not self.low < self.high:
            raise ValueError(f"low below high, got low {self.low:g} and high {self.high:g}")
        if not self.low <= self.mode <= self.high:
            raise ValueError(f"a mode between low {self.low:g} and high {self.high:g}, got {self.mode:g}")
        return self

    def quantile(self, u: np.ndarray) -> np.ndarray:
        low, mode, high = self.low, self.mode, self.high
        split = (mode - low) / (high - low)
        left = low + np.sqrt(u * (high - low) * (mode - low))
        right = high - np.sqrt((1 - u) * (high - low) * (high - mode))
        return np.where(u < split, left, right)

    def central(self) -> float:
        return self.mode


class Uniform(_Distribution):
    """Uniform distribution between low and high (low < high)."""

    distribution: Literal["uniform"]
    low: float
    high: float

    @model_validator(mode="after")
    def _ordered(self):
        if not self.low < self.high:
            raise ValueError(f"low below high, got low {self.low:g} and high {self.high:g}")
        return self

    def quantile(self, u: np.ndarray) -> np.ndarray:
        return self.low + (self.high - self.low) * u

    def central(self) -> float:
        return (self.low + self.high) / 2


class Discrete(_Distribution):
    """A choice among listed values (numbers, or factor ids for a factor parameter) with weights."""

    distribution: Literal["discrete"]
    values: list[float] | list[str] = Field(min_length=1)
    weights: list[float] | None = None

    @model_validator(mode="after")
    def _weights_fit(self):
        weights = self.weights
        if weights is None:
            return self
        if len(weights) != len(self.values):
            raise ValueError(f"one weight per value ({len(self.values)}), got {len(weights)}")
        if any(w < 0 for w in weights) or not sum(weights) > 0:
            raise ValueError("weights >= 0 with a positive sum")
        return self

    def probabilities(self) -> np.ndarray:
        weights = np.ones(len(self.values)) if self.weights is None else np.asarray(self.weights, dtype=float)
        return weights / weights.sum()

    def index(self, u: np.ndarray) -> np.ndarray:
        """Which value each uniform draw picks (inverse of the cumulative weights)."""
        cumulative = np.cumsum(self.probabilities())
        return np.minimum(np.searchsorted(cumulative, u, side="right"), len(self.values) - 1)

    def numeric_values(self) -> bool:
        return not any(isinstance(v, str) for v in self.values)

    def quantile(self, u: np.ndarray) -> np.ndarray:
        return np.asarray(self.values, dtype=float)[self.index(u)]

    def central(self):
        return self.values[int(np.argmax(self.probabilities()))]


Distribution = Annotated[
    Union[Normal, Lognormal, Pedigree, Triangular, Uniform, Discrete], Field(discriminator="distribution")
]


class Correlation(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)
    inputs: list[str] = Field(min_length=2, max_length=2)
    rank: float = Field(ge=-1, le=1, description="Spearman rank correlation")

    @field_validator("rank", mode="before")
    @classmethod
    def _rank_is_a_number(cls, value):
        return numbers_only(value, "rank")


class Uncertainty(BaseModel):
    """Every uncertain input of a run: parameter paths and factor ids, and their correlations."""

    model_config = ConfigDict(extra="forbid", frozen=True)
    sampling: Literal[SAMPLINGS] = "random"
    parameters: dict[str, Distribution] = {}
    factors: dict[str, Distribution] = {}
    correlations: list[Correlation] = []

    def names(self) -> list[str]:
        """Inputs in a fixed order: parameters first, then factors (as written)."""
        return [f"parameter {p}" for p in self.parameters] + [f"factor {f}" for f in self.factors]

    def merged(self, other: Uncertainty, sampling: str | None = None) -> Uncertainty:
        """This table with ``other`` laid over it (its entries win)."""
        return Uncertainty(
            sampling=sampling or (other.sampling if "sampling" in other.model_fields_set else self.sampling),
            parameters={**self.parameters, **other.parameters},
            factors={**self.factors, **other.factors},
            correlations=list(self.correlations) + list(other.correlations),
        )


def parse_uncertainty(data: dict, source: str, prefix: str = "uncertainty") -> Uncertainty:
    """A raw ``[uncertainty]`` table -> the validated model, or one InputError line."""
    try:
        return Uncertainty.model_validate(data)
    except ValidationError as error:
        first = error.errors()[0]
        loc = [
            str(part) for part in first["loc"] if part not in KINDS and not str(part).startswith(("list[", "tuple["))
        ]
        field = ".".join([part for part in [prefix, *loc] if part])
        kind = first["type"]
        context = first.get("ctx") or {}
        if kind in ("greater_than_equal", "greater_than", "less_than_equal", "less_than"):
            words = {"greater_than_equal": ">=", "greater_than": ">", "less_than_equal": "<=", "less_than": "<"}[kind]
            expected = f"a number {words} {next(iter(context.values()), '')}, got {first.get('input')!r}"
        elif kind == "value_error":
            expected = str(context.get("error", first["msg"]))
        elif kind == "extra_forbidden":
            expected = (
                "no such key (distribution, mean, sd, median, gsd, low, mode, high, values, weights, scores, basic_gsd)"
            )
        elif kind == "union_tag_invalid":
            expected = (
                f"distribution one of {', '.join(KINDS)}, got {first.get('input', {}).get('distribution')!r}"
                if isinstance(first.get("input"), dict)
                else first["msg"]
            )
        elif kind == "missing":
            expected = "a value is required"
        else:
            expected = first["msg"].lower()
        raise InputError(source, field, expected) from None


def read_distributions_file(path: str | Path) -> Uncertainty:
    """A distributions TOML file: the same keys as a project's ``[uncertainty]`` table, at the top level
    (an ``[uncertainty]`` table inside it is read too)."""
    path = Path(path)
    raw = read_input_bytes(path, "distributions file", MAX_PROJECT_BYTES)
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as error:
        raise InputError(path, "", f"valid UTF-8 TOML ({error})") from None
    data = loads_toml(text, path)  # nested at most as deep as a project file
    nested = "uncertainty" in data
    return parse_uncertainty(data["uncertainty"] if nested else data, str(path), prefix="uncertainty" if nested else "")


__all__ = [
    "Uncertainty",
    "Distribution",
    "Pedigree",
    "KINDS",
    "Correlation",
    "parse_uncertainty",
    "read_distributions_file",
    "SAMPLINGS",
]
