"""The options of one assessment, held once (in the manner of pvlib's ModelChain).

A command line call or a notebook user builds one ``Assessment``: the factor set, the GWP100 set of
the headline result, the schemes to check, the parameter overrides, the system boundary, the
assessment year and the electricity matching. Every step of the pipeline (read, prepare, solve,
judge, analyse, render) reads its options from it instead of taking them one by one, so a new
option is added here once and reaches every command.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

from ..errors import InputError
from ..model.factors import FactorSet
from ..model.project import boundary_id, boundary_overrides
from ..model.rulebooks import scheme_ids
from .scoring import DEFAULT_GWP, Prepared, gwp_set, prepare, rulebooks
from .verdicts import FIRST_YEAR, LAST_YEAR


@dataclass(frozen=True)
class Assessment:
    """What is asked of every project of a run.

    Attributes
    ----------
    factor_set : FactorSet
        The loaded factor set (with any override rows laid over it).
    gwp : str
        GWP100 set of the headline result: ar4, ar5 or ar6. Each scheme check uses its rulebook's own.
    schemes : tuple of str or None
        Scheme ids to check, as the rulebooks spell them; None for every scheme that applies.
    overrides : tuple of str
        ``dotted.parameter=value`` overrides applied to each project before validation.
    boundary : str or None
        cradle-to-gate, well-to-tank or well-to-wake; None for each project's own.
    year : int or None
        The assessment year whose dates the scheme rules are read on; None for each project's
        default (the first full calendar year after its commissioning date, else this year).
    matching : str or None
        With an electricity time series: None (each scheme's dated rule), a granularity for every
        scheme (a what-if), or ``declared`` (the declared annual shares).
    """

    factor_set: FactorSet
    gwp: str = DEFAULT_GWP
    schemes: tuple[str, ...] | None = None
    overrides: tuple[str, ...] = field(default_factory=tuple)
    boundary: str | None = None
    year: int | None = None
    matching: str | None = None

    def __post_init__(self) -> None:
        """Every option checked once, before any project is read (one ``InputError`` line)."""
        object.__setattr__(self, "gwp", gwp_set(self.gwp, self.factor_set))
        if self.schemes is not None:
            object.__setattr__(self, "schemes", tuple(scheme_ids(list(self.schemes), rulebooks())) or None)
        if self.boundary is not None:
            object.__setattr__(self, "boundary", boundary_id(self.boundary))
        if self.year is not None and (isinstance(self.year, bool) or not FIRST_YEAR <= self.year <= LAST_YEAR):
            raise InputError("--year", str(self.year), f"an assessment year from {FIRST_YEAR} to {LAST_YEAR}")
        object.__setattr__(self, "overrides", tuple(self.overrides or ()))

    @property
    def project_overrides(self) -> list[str]:
        """The overrides a project file is read with: the user's, then the boundary (``project.boundary``)."""
        return boundary_overrides(self.boundary, list(self.overrides))

    @property
    def scheme_list(self) -> list[str] | None:
        """The scheme ids as a list, or None for every scheme that applies."""
        return list(self.schemes) if self.schemes else None

    def but(self, **changes) -> Assessment:
        """The same assessment with some options changed (e.g. another year or scheme)."""
        return replace(self, **changes)

    def prepare(
        self, project, *, source: str = "project", project_sha256: str = "", matched_periods: dict | None = None
    ) -> Prepared:
        """A validated project made ready to solve under these options (``core.scoring.prepare``).

        Parameters
        ----------
        project : Project
            The validated project model (read with ``project_overrides``).
        source : str
            The project file's path, named in results and error lines.
        project_sha256 : str
            The sha256 of the project file's bytes.
        matched_periods : dict or None
            Electricity source name -> the finest period a time series shows it matched.

        Returns
        -------
        Prepared
            Inventory, matrices, characterisation vectors and the schemes to check.
        """
        return prepare(
            project,
            self.factor_set,
            gwp=self.gwp,
            schemes=self.scheme_list,
            source=source,
            project_sha256=project_sha256,
            boundary=self.boundary,
            year=self.year,
            matching=matched_periods,
        )
