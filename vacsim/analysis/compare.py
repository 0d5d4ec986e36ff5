"""Side-by-side comparison of rig variants: the same summary figures, the best of each, and the
differences stated in words against the first variant."""

from __future__ import annotations

from dataclasses import dataclass, field

from ..scenario import Scenario, load_scenario

# The figures compared: summary key, row label, which way is better ("low", "high", or None
# for figures that only inform), and how the value is shown ("duration", "pressure", ...).
FIGURES = (
    ("target_pressure_pa", "target pressure", None, "pressure"),
    ("time_to_target_s", "reaches target after", "low", "duration"),
    ("usable_duration_s", "holds target for", "high", "duration"),
    ("min_pressure_pa", "lowest pressure", "low", "pressure"),
    ("ultimate_pressure_start_pa", "ultimate at start (steady)", "low", "pressure"),
    ("final_pressure_pa", "pressure at end", "low", "pressure"),
    ("min_tub_temperature_k", "coldest tub", None, "temperature"),
    ("max_tub_temperature_k", "warmest tub", "low", "temperature"),
    ("final_tub_temperature_k", "tub at end", "low", "temperature"),
    ("ice_gone_s", "last ice gone after", None, "duration"),  # with top-ups: the last melt-out
    ("motive_flow_m3_s", "motive flow", "high", "flow"),
    ("ejector_speed_m3_s", "ejector speed at start", "high", "speed"),
    ("pump_heat_w", "pump heat into tub", "low", "power"),
)
# Values this close (relative) count as a tie.
TIE_RELATIVE = 1e-6
# Differences smaller than these are "about the same".
SAME_DURATION_S = 60.0
SAME_PRESSURE_RELATIVE = 0.02
SAME_TEMPERATURE_K = 0.2


def _rank_value(value, better):
    """A sortable number where smaller is better; a missing value ranks last."""
    if value is None:
        return float("inf")
    return value if better == "low" else -value


def best_of(names: list[str], summaries: list[dict]) -> dict:
    """Per figure with a direction, the name of the best variant (None when all tie).

    A variant that never reaches its target ranks last on time to target.
    """
    best = {}
    for key, _, better, _ in FIGURES:
        if better is None:
            continue
        ranks = [_rank_value(s.get(key), better) for s in summaries]
        finite = [r for r in ranks if r != float("inf")]
        if not finite:
            best[key] = None
            continue
        top = min(ranks)
        tied = [n for n, r in zip(names, ranks) if abs(r - top) <= TIE_RELATIVE * max(abs(top), 1e-300)]
        best[key] = None if len(tied) == len(names) else tied[0]
    return best


def winners(names: list[str], summaries: list[dict]) -> dict:
    """Per figure, every variant that shares the best value (for highlighting a table)."""
    out = {}
    for key, _, better, _ in FIGURES:
        if better is None:
            continue
        ranks = [_rank_value(s.get(key), better) for s in summaries]
        top = min(ranks)
        if top == float("inf"):
            out[key] = []
            continue
        tied = [n for n, r in zip(names, ranks) if abs(r - top) <= TIE_RELATIVE * max(abs(top), 1e-300)]
        out[key] = [] if len(tied) == len(names) else tied
    return out


def duration_words(seconds: float) -> str:
    """A duration [s] in words: '1 h 05 min', '48 min', '3 min 04 s', '40 s'."""
    s = int(round(abs(seconds)))  # whole minutes cut as in units.format_duration, so text and tables agree
    if s >= 3600:
        return f"{s // 3600} h {s % 3600 // 60:02d} min"
    if s >= 600:
        return f"{s // 60} min"
    if s >= 60:
        return f"{s // 60} min {s % 60:02d} s"
    return f"{s} s"


def _p(value_pa, unit):
    from ..units import format_pressure

    return format_pressure(value_pa, unit)


def _t(value_k):
    from ..units import format_temperature

    return format_temperature(value_k)


def differences(names: list[str], summaries: list[dict], unit: str = "mbar") -> list[str]:
    """Each variant against the first, in sentences ("B holds 15 mbar 48 min longer than A")."""
    if len(names) < 2:
        return []
    a_name, a = names[0], summaries[0]
    lines = []
    for b_name, b in zip(names[1:], summaries[1:]):
        lines += _pair(a_name, a, b_name, b, unit)
    return lines


def _pair(a_name, a, b_name, b, unit) -> list[str]:
    out = []
    ta, tb = a["target_pressure_pa"], b["target_pressure_pa"]
    same_target = ta is not None and tb is not None and abs(ta - tb) <= 1e-6 * ta
    # holding the target
    if ta is not None and tb is not None:
        ha, hb = a["usable_duration_s"], b["usable_duration_s"]
        reached_a, reached_b = a["usable_start_s"] is not None, b["usable_start_s"] is not None
        what_b = _p(tb, unit) if same_target else f"its {_p(tb, unit)} target"
        what_a = "" if same_target else f" holds its {_p(ta, unit)} target"
        if not reached_a and not reached_b:
            out.append(f"Neither {a_name} nor {b_name} reaches {'the ' + _p(ta, unit) if same_target else 'its'} target.")
        elif not reached_b:
            out.append(f"{b_name} never reaches {what_b}; {a_name} holds {'it' if same_target else 'its ' + _p(ta, unit) + ' target'} for {duration_words(ha)}.")
        elif not reached_a:
            out.append(f"{b_name} holds {what_b} for {duration_words(hb)}; {a_name} never reaches {'it' if same_target else 'its ' + _p(ta, unit) + ' target'}.")
        elif abs(hb - ha) < SAME_DURATION_S:
            held = _p(tb, unit) if same_target else "their targets"
            out.append(f"{b_name} and {a_name} hold {held} about equally long ({duration_words(hb)}).")
        else:
            word = "longer" if hb > ha else "shorter"
            out.append(f"{b_name} holds {what_b} {duration_words(hb - ha)} {word} than {a_name}{what_a} ({duration_words(hb)} against {duration_words(ha)}).")
        # reaching it
        ra, rb = a["time_to_target_s"], b["time_to_target_s"]
        if ra is not None and rb is not None and abs(rb - ra) >= 1.0:
            word = "sooner" if rb < ra else "later"
            out.append(f"{b_name} reaches {what_b} {duration_words(rb - ra)} {word} than {a_name} ({duration_words(rb)} against {duration_words(ra)}).")
    # lowest pressure
    pa, pb = a["min_pressure_pa"], b["min_pressure_pa"]
    if abs(pb - pa) > SAME_PRESSURE_RELATIVE * min(pa, pb):
        word = "lower" if pb < pa else "higher"
        out.append(f"{b_name}'s lowest pressure is {_p(abs(pb - pa), unit)} {word} than {a_name}'s ({_p(pb, unit)} against {_p(pa, unit)}).")
    else:
        out.append(f"{b_name} and {a_name} bottom out at about the same pressure ({_p(pb, unit)} and {_p(pa, unit)}).")
    # the end of the run
    ea, eb = a["final_pressure_pa"], b["final_pressure_pa"]
    if abs(eb - ea) > SAME_PRESSURE_RELATIVE * min(ea, eb):
        word = "better" if eb < ea else "worse"
        out.append(f"At the end of the run {b_name} is at {_p(eb, unit)}, {word} than {a_name} at {_p(ea, unit)}.")
    fa, fb = a["final_tub_temperature_k"], b["final_tub_temperature_k"]
    if abs(fb - fa) >= SAME_TEMPERATURE_K:
        word = "colder" if fb < fa else "warmer"
        out.append(f"{b_name}'s tub ends {abs(fb - fa):.1f} K {word} than {a_name}'s ({_t(fb)} against {_t(fa)}).")
    return out


def _simulate_variant(scenario: Scenario):
    """Worker task: one variant's run."""
    from ..simulation import simulate

    return simulate(scenario)


def variant_names(scenarios: list[Scenario]) -> list[str]:
    """The scenarios' names, made unique ('name', 'name#2') when two share one."""
    seen: dict[str, int] = {}
    out = []
    for s in scenarios:
        seen[s.name] = seen.get(s.name, 0) + 1
        out.append(s.name if seen[s.name] == 1 else f"{s.name}#{seen[s.name]}")
    return out


@dataclass
class Comparison:
    """The compared variants' runs and what they show (SI units)."""

    names: list[str]
    sources: list[str]
    results: list = field(default_factory=list)  # RunResult per variant
    best: dict = field(default_factory=dict)
    winners: dict = field(default_factory=dict)
    differences: list = field(default_factory=list)

    @property
    def summaries(self) -> list[dict]:
        return [r.summary for r in self.results]

    def to_json(self) -> dict:
        variants = []
        for name, source, summary in zip(self.names, self.sources, self.summaries):
            variants.append({"variant": name, "source": source, **summary})
        return {
            "variants": variants,
            "best": self.best,
            "differences": self.differences,
            "figures": [{"key": k, "label": label, "better": better} for k, label, better, _ in FIGURES],
        }


def compare(
    paths, hold: float | None = None, executor=None, jobs: int | None = None, progress: bool | None = False, unit: str = "mbar"
) -> Comparison:
    """Simulate two or more scenario files and compare them.

    Parameters
    ----------
    paths : list of str or Path
        Scenario files; the first is the reference the differences are stated against.
    hold : float, optional
        Compare against this target pressure [Pa] instead of each file's own target.
    executor, jobs, progress
        As for vacsim.analysis.executor.run_many.
    unit : str
        Pressure unit the sentences use.

    Returns
    -------
    Comparison
    """
    from ..errors import InputError
    from ..scenario import source_of
    from .executor import run_many

    paths = list(paths)
    if len(paths) < 2:
        raise InputError("compare: give two or more scenario files")
    scenarios = [load_scenario(p) for p in paths]
    if hold is not None:
        from .ice_budget import with_target

        scenarios = [with_target(s, hold) for s in scenarios]
    names = variant_names(scenarios)
    results = list(run_many(_simulate_variant, scenarios, executor=executor, jobs=jobs, progress=progress, label="compare"))
    summaries = [r.summary for r in results]
    return Comparison(
        names=names,
        sources=[source_of(s) for s in scenarios],
        results=results,
        best=best_of(names, summaries),
        winners=winners(names, summaries),
        differences=differences(names, summaries, unit),
    )
