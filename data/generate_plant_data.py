"""Generate the demo plant data: hourly historian-like series for the demo exchangers.

THE DATA WRITTEN BY THIS SCRIPT IS INVENTED. It describes no real plant: each series is made by the rating engine
(``revamp.rate``) from invented process variations and a known fouling law, then spoiled on purpose with sensor noise,
a drifting thermocouple and a few bad rows (missing and non-numeric cells, a duplicated timestamp, a stuck sensor, a
pump trip, an impossible temperature), so that ``revamp.monitor`` has something realistic to clean up.

Run from the repository root::

    python data/generate_plant_data.py            # writes data/demo/plant/<tag>.csv for every demo exchanger
    python data/generate_plant_data.py AC-301     # only the exchangers named

The CSVs use the standard column names in SI (``timestamp``, ``shell_flow`` [kg/s], ``shell_t_in``, ``shell_t_out``
[K], ``tube_flow`` [kg/s], ``tube_t_in``, ``tube_t_out`` [K]) plus ``rf_true`` [m²K/W, outside area], the fouling
resistance the series was made with (kept so that a reader can see how well it is recovered).

An air cooler's series (``kind: air cooler`` in the unit file) is written as a historian would export it, with tag
names and plant units that the unit file maps (``columns``): tube flow [t/h], tube inlet and outlet [°C], the
ambient at the cooler [°C]; the air flow is not measured (the fans run at their fixed speed: the stated air flow).
The ambient follows an invented season and day.
"""
from __future__ import annotations

import shutil
import sys
import tempfile
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pandas as pd

DAY = 86400.0
YEAR = 365.0 * DAY


@dataclass(frozen=True)
class Linear:
    """Rf = a + b·t [m²K/W, outside area]; b given per year."""

    a: float
    b_per_year: float

    def __call__(self, t, conditions=None):
        return self.a + self.b_per_year * np.asarray(t) / YEAR


@dataclass(frozen=True)
class Asymptotic:
    """Rf = Rf0 + Rf∞·(1 − exp(−t/τ)) (Kern & Seaton 1959), τ in days."""

    rf0: float
    rf_inf: float
    tau_days: float

    def __call__(self, t, conditions=None):
        return self.rf0 + self.rf_inf * (1.0 - np.exp(-np.asarray(t) / (self.tau_days * DAY)))


@dataclass(frozen=True)
class Threshold:
    """Ebert & Panchal (1995) form, integrated along the series with the clean rating's conditions.

    Invented parameters set by what they do at the median conditions of the series: ``net_per_year`` is the net
    fouling rate there [m²K/W per year], ``removal_share`` the part of the deposition that the shear term removes
    there; ``E`` the activation energy [J/mol], ``beta`` the Reynolds exponent.
    """

    rf0: float
    net_per_year: float
    E: float = 60e3
    removal_share: float = 0.5
    beta: float = -0.66

    def __call__(self, t, conditions):
        from revamp.fouling.models import threshold_rate

        Re, Pr, Tf, shear = (np.asarray(conditions[k]) for k in ("Re", "Pr", "T_film", "shear"))
        T_ref = float(np.median(Tf))
        dep_med = float(np.median(Re) ** self.beta * np.median(Pr) ** -0.33)
        total = self.net_per_year / YEAR / (1.0 - self.removal_share)  # deposition rate at the median [1/s units]
        alpha_ref = total / dep_med
        gamma = self.removal_share * total / float(np.median(shear))
        rate = threshold_rate(Re, Pr, Tf, shear, alpha_ref, self.E, gamma, self.beta, T_ref)
        t = np.asarray(t, dtype=float)
        rf = self.rf0 + np.concatenate([[0.0], np.cumsum(0.5 * (rate[1:] + rate[:-1]) * np.diff(t))])
        return np.maximum(rf, 0.0)


def _process(rng, n, hours_step=1.0):
    """Invented operating variations: weekly swing, slow wander, a few throughput steps; factor ~1."""
    t_h = np.arange(n) * hours_step
    wander = np.cumsum(rng.normal(0.0, 0.002, n))
    wander -= np.linspace(0, 1, n) * wander[-1]  # no long drift in throughput
    steps = np.zeros(n)
    for start in rng.choice(n, size=max(n // 700, 1), replace=False):
        steps[start:start + int(rng.integers(48, 240))] += rng.choice([-0.06, 0.05])
    return 1.0 + 0.03 * np.sin(2 * np.pi * t_h / 168.0) + wander + steps


def generate(exchanger, service, start="2031-01-01", hours=8760, fouling_law=None, seed=0, *, fouling_side="tube",
             flow_noise=0.01, temperature_noise=0.3, drift=0.8, bad_rows=True) -> pd.DataFrame:
    """An invented hourly series for one exchanger.

    Parameters
    ----------
    exchanger : revamp.ShellAndTube
        The exchanger.
    service : revamp.Service
        The design-day service: fluids, typical flows and inlet temperatures [SI].
    start : str
        First timestamp.
    hours : int
        Number of hourly rows.
    fouling_law : callable or None
        ``law(t, conditions) -> Rf`` [m²K/W, outside area] at run time t [s] (``Linear``, ``Asymptotic``,
        ``Threshold``); None for a clean exchanger.
    seed : int
        Random seed (the same seed gives the same series).
    fouling_side : {"tube", "shell"}
        Side the deposit forms on.
    flow_noise : float
        Relative standard deviation of the flow readings [-].
    temperature_noise : float
        Standard deviation of the temperature readings [K].
    drift : float
        The tube outlet thermocouple drifts linearly by this much over the series [K].
    bad_rows : bool
        Spoil a few rows (missing, non-numeric, duplicated timestamp, stuck sensor, pump trip, impossible value).

    Returns
    -------
    pandas.DataFrame
        Standard columns in SI (temperatures in K) plus ``rf_true``; timestamps as text.
    """
    import revamp as rv

    rng = np.random.default_rng(seed)
    n = int(hours)
    t = np.arange(n) * 3600.0
    m_s = service.shell.flow * _process(rng, n)
    m_t = service.tube.flow * _process(rng, n)
    day = 2 * np.pi * t / DAY
    ts_in = service.shell.t_in + 2.0 * np.sin(2 * np.pi * t / (9 * DAY)) + np.cumsum(rng.normal(0, 0.05, n))
    ts_in -= np.linspace(0, 1, n) * (ts_in[-1] - ts_in[0])
    tt_in = service.tube.t_in + 1.5 * np.sin(day - 2.0) + rng.normal(0, 0.1, n)

    def service_at(rf):
        do, di = exchanger.tube_od, exchanger.tube_id
        rf = np.broadcast_to(rf, (n,))
        return rv.Service(shell=rv.Stream(service.shell.fluid, m_s, ts_in),
                          tube=rv.Stream(service.tube.fluid, m_t, tt_in),
                          fouling_shell=rf if fouling_side == "shell" else 0.0,
                          fouling_tube=rf * di / do if fouling_side == "tube" else 0.0)

    def rating(rf):
        # a sweep never fails as a whole: a case that cannot settle is reported in the rating's warnings
        return rv.rate(exchanger, service_at(rf))

    if fouling_law is None:
        rf = np.zeros(n)
    else:
        clean = rating(np.zeros(n))
        from revamp.fouling.models import film_temperature

        cond = {"Re": clean.Re_tube, "Pr": clean.Pr_tube, "shear": clean.shear_tube,
                "T_film": film_temperature(0.5 * (tt_in + clean.t_out_tube), clean.t_wall_tube)}
        rf = np.asarray(fouling_law(t, cond), dtype=float) * np.ones(n)
    r = rating(rf)
    df = pd.DataFrame({
        "timestamp": pd.date_range(start, periods=n, freq="h").strftime("%Y-%m-%d %H:%M:%S"),
        "shell_flow": m_s * (1 + rng.normal(0, flow_noise, n)),
        "shell_t_in": ts_in + rng.normal(0, temperature_noise, n),
        "shell_t_out": r.t_out_shell + rng.normal(0, temperature_noise, n),
        "tube_flow": m_t * (1 + rng.normal(0, flow_noise, n)),
        "tube_t_in": tt_in + rng.normal(0, temperature_noise, n),
        "tube_t_out": r.t_out_tube + rng.normal(0, temperature_noise, n) + drift * t / max(t[-1], 1.0),
        "rf_true": rf,
    })
    for c in ("shell_flow", "tube_flow"):
        df[c] = df[c].round(4)
    for c in ("shell_t_in", "shell_t_out", "tube_t_in", "tube_t_out"):
        df[c] = df[c].round(3)
    if bad_rows and n > 500:
        df = _spoil(df, rng)
    return df


def _spoil(df: pd.DataFrame, rng) -> pd.DataFrame:
    """A few bad rows of the kinds a historian export has (positions are random but reproducible)."""
    df = df.astype({c: object for c in df.columns if c not in ("timestamp", "rf_true")})
    n = len(df)
    cols = ["shell_flow", "shell_t_in", "shell_t_out", "tube_flow", "tube_t_in", "tube_t_out"]
    rows = rng.choice(np.arange(100, n - 100), size=12, replace=False)
    for i in rows[:5]:
        df.loc[i, str(rng.choice(cols))] = ""                       # missing value
    for i in rows[5:7]:
        df.loc[i, str(rng.choice(cols))] = "Bad Input"              # historian text instead of a number
    i = int(rows[7])
    df.loc[i:i + 11, "shell_t_out"] = df.loc[i, "shell_t_out"]      # a stuck transmitter, 12 h
    i = int(rows[8])
    df.loc[i:i + 2, "tube_flow"] = 0.0                              # pump trip, 3 h
    i = int(rows[9])
    df.loc[i, "tube_t_out"] = df.loc[i, "tube_t_in"] - 5.0          # an impossible reading on the cold side
    dup = df.loc[[int(rows[10])]].copy()                            # a duplicated row (historian re-send)
    df = pd.concat([df.iloc[:int(rows[10]) + 1], dup, df.iloc[int(rows[10]) + 1:]], ignore_index=True)
    return df


#: historian tag of each standard column of an air cooler's series, with its unit (the unit file maps them back)
AIR_TAGS = {"tube_flow": ("FI-{n}", "t/h"), "tube_t_in": ("TI-{n}A", "degC"), "tube_t_out": ("TI-{n}B", "degC"),
            "air_t_in": ("TI-{n}AMB", "degC")}


def generate_air(exchanger, service, start="2031-01-01", hours=8760, fouling_law=None, seed=0, *, number="301",
                 flow_noise=0.01, temperature_noise=0.3, bad_rows=True) -> pd.DataFrame:
    """An invented hourly series for one air cooler (tube side and ambient; the air flow is the stated one).

    Parameters
    ----------
    exchanger : revamp.AirCooler
    service : revamp.AirService
        The design-day service: tube fluid, typical tube flow and inlet, the stated air flow, the ambient around
        which the season turns.
    fouling_law : callable or None
        ``law(t) -> Rf`` [m²K/W, total on the bare outside-tube area] at run time t [s]; put on the tube side (the
        data cannot tell the sides apart: only the total is recovered).
    number : str
        The loop number in the historian tags (``FI-301``...).

    Returns
    -------
    pandas.DataFrame
        The historian columns (``timestamp`` and :data:`AIR_TAGS`) plus ``rf_true``.
    """
    import revamp as rv

    rng = np.random.default_rng(seed)
    n = int(hours)
    t = np.arange(n) * 3600.0
    m_t = service.tube.flow * _process(rng, n)
    tt_in = service.tube.t_in + 1.5 * np.sin(2 * np.pi * t / (9 * DAY)) + rng.normal(0, 0.1, n)
    # invented weather: a season of ±9 K around 8 K below the design-day ambient, a day of ±3.5 K, some wander
    season = -8.0 + 9.0 * np.sin(2 * np.pi * (t / YEAR - 0.3))
    day = 3.5 * np.sin(2 * np.pi * (t / DAY - 0.375))
    wander = np.cumsum(rng.normal(0.0, 0.08, n))
    wander -= np.linspace(0, 1, n) * wander[-1]
    ambient = service.air_in + season + day + wander
    rf = np.zeros(n) if fouling_law is None else np.asarray(fouling_law(t), dtype=float) * np.ones(n)
    do, di = exchanger.tube_od, exchanger.tube_id
    r = rv.rate(exchanger, rv.AirService(tube=rv.Stream(service.tube.fluid, m_t, tt_in), air_in=ambient,
                                         air_flow=service.air_flow, face_velocity=service.face_velocity,
                                         altitude=service.altitude, fouling_tube=rf * di / do, fouling_air=0.0))
    tag = {k: v[0].format(n=number) for k, v in AIR_TAGS.items()}
    df = pd.DataFrame({
        "timestamp": pd.date_range(start, periods=n, freq="h").strftime("%Y-%m-%d %H:%M:%S"),
        tag["tube_flow"]: (m_t * (1 + rng.normal(0, flow_noise, n)) * 3.6).round(3),          # kg/s -> t/h
        tag["tube_t_in"]: (tt_in + rng.normal(0, temperature_noise, n) - 273.15).round(2),   # K -> °C
        tag["tube_t_out"]: (r.t_out_tube + rng.normal(0, temperature_noise, n) - 273.15).round(2),
        tag["air_t_in"]: (ambient + rng.normal(0, temperature_noise, n) - 273.15).round(2),
        "rf_true": rf,
    })
    if bad_rows and n > 500:
        df = df.astype({c: object for c in df.columns if c not in ("timestamp", "rf_true")})
        rows = rng.choice(np.arange(100, n - 100), size=6, replace=False)
        cols = [tag[k] for k in AIR_TAGS]
        for i in rows[:3]:
            df.loc[i, str(rng.choice(cols))] = ""                          # missing value
        df.loc[int(rows[3]), tag["tube_t_out"]] = "Bad Input"              # historian text instead of a number
        i = int(rows[4])
        df.loc[i:i + 9, tag["air_t_in"]] = df.loc[i, tag["air_t_in"]]      # a stuck ambient transmitter, 10 h
        i = int(rows[5])
        df.loc[i:i + 2, tag["tube_flow"]] = 0.0                            # the product pump tripped, 3 h
    return df


# invented fouling laws of the demo exchangers (tube side is the crude / the cooling water)
DEMO_LAWS = {
    "E-101": Asymptotic(rf0=5e-5, rf_inf=4.0e-4, tau_days=90.0),
    "E-102": Linear(a=1.0e-4, b_per_year=6.0e-4),
    "E-103": Threshold(rf0=5e-5, net_per_year=2.0e-4),
    "E-104": Threshold(rf0=1.0e-4, net_per_year=8.0e-4),
    "E-105": Asymptotic(rf0=5e-5, rf_inf=3.0e-4, tau_days=120.0),
    "C-201": Asymptotic(rf0=2e-5, rf_inf=2.5e-4, tau_days=60.0),
    # air cooler: total on the bare outside-tube area (fins collect dust and pollen; invented)
    "AC-301": Asymptotic(rf0=5e-5, rf_inf=3.5e-4, tau_days=150.0),
    "C-401": Asymptotic(rf0=5e-5, rf_inf=3.5e-4, tau_days=100.0),
}


def generate_condenser(case, start="2031-01-01", days=365, step_hours=3, fouling_law=None, seed=0,
                       flow_noise=0.01, temperature_noise=0.2, pressure_noise=0.003) -> pd.DataFrame:
    """An invented series for one shell-and-tube condenser (a ``kind: condenser`` case of the unit file).

    The column runs at its condensing pressure (the pressure transmitter reads it with ``pressure_noise``, relative);
    the vapour load and the coolant flow swing with the process, the coolant inlet with the day; the deposit forms on
    the coolant side (``fouling_law(t, {}) -> Rf`` [m²K/W, outside area]). Each row is rated zone by zone
    (:func:`revamp.rating_condenser.rate_condenser`) for the coolant outlet. Columns: ``timestamp``,
    ``coolant_flow`` [kg/s], ``coolant_t_in``, ``coolant_t_out`` [K], ``condensing_pressure`` [Pa],
    ``condensate_t`` [K], ``rf_true`` (the fouling on the coolant side alone; the vapour side keeps its design value).
    """
    from revamp.rating_condenser import rate_condenser

    rng = np.random.default_rng(seed)
    n = int(days * 24 // step_hours)
    t = np.arange(n) * step_hours * 3600.0
    svc, c_side, k_side = case.service, case.condensing_side, case.coolant_side
    vapour, coolant = getattr(svc, c_side), getattr(svc, k_side)
    m_v = vapour.flow * _process(rng, n, step_hours)
    m_c = coolant.flow * _process(rng, n, step_hours)
    tc_in = coolant.t_in + 2.0 * np.sin(2 * np.pi * t / DAY - 2.0) + rng.normal(0, 0.1, n)
    rf = np.zeros(n) if fouling_law is None else np.asarray(fouling_law(t, {}), dtype=float) * np.ones(n)
    ex = case.exchanger
    fouled = svc.replace(**{c_side: vapour.replace(flow=m_v), k_side: coolant.replace(flow=m_c, t_in=tc_in)},
                         **{f"fouling_{k_side}": getattr(svc, f"fouling_{k_side}") * 0 + (
                             rf * ex.tube_id / ex.tube_od if k_side == "tube" else rf)})
    r = rate_condenser(ex, fouled)
    df = pd.DataFrame({
        "timestamp": pd.date_range(start, periods=n, freq=f"{step_hours}h").strftime("%Y-%m-%d %H:%M:%S"),
        "coolant_flow": (m_c * (1 + rng.normal(0, flow_noise, n))).round(4),
        "coolant_t_in": (tc_in + rng.normal(0, temperature_noise, n)).round(3),
        "coolant_t_out": (np.asarray(r.t_out_coolant) + rng.normal(0, temperature_noise, n)).round(3),
        "condensing_pressure": (float(vapour.fluid.pressure) * (1 + rng.normal(0, pressure_noise, n))).round(1),
        "condensate_t": (np.asarray(r.t_out_condensing) + rng.normal(0, temperature_noise, n)).round(3),
        "rf_true": rf,
    })
    df = df.astype({c: object for c in ("coolant_flow", "coolant_t_out")})
    for i in rng.choice(np.arange(50, n - 50), size=4, replace=False):
        df.loc[int(i), str(rng.choice(["coolant_flow", "coolant_t_out"]))] = ""  # missing values
    return df


def _load_unit(path: Path):
    """Load the demo unit file; its plant-data files may not exist yet, so load a copy without them."""
    import yaml

    from revamp import unitfile

    doc = yaml.safe_load(path.read_text(encoding="utf-8"))
    for x in doc.get("exchangers", []):
        x.pop("plant_data", None)
    doc.pop("cleaning", None)  # the cleaning plan needs the plant data this script is about to write
    with tempfile.TemporaryDirectory() as tmp:
        copy = Path(tmp) / path.name
        copy.write_text(yaml.safe_dump(doc, sort_keys=False), encoding="utf-8")
        if (path.parent / "curves").is_dir():  # a condenser's condensing-curve files, read relative to the unit file
            shutil.copytree(path.parent / "curves", Path(tmp) / "curves")
        return unitfile.load(copy)


def main(argv=None) -> int:
    here = Path(__file__).resolve().parent
    unit = _load_unit(here / "demo" / "unit.yaml")
    out = here / "demo" / "plant"
    out.mkdir(parents=True, exist_ok=True)
    only = set((sys.argv[1:] if argv is None else argv) or [])
    for k, case in enumerate(unit.exchangers):
        if only and case.tag not in only:
            continue
        law = DEMO_LAWS.get(case.tag, Asymptotic(rf0=5e-5, rf_inf=3e-4, tau_days=90.0))
        if getattr(case, "kind", None) == "condenser":
            df = generate_condenser(case, fouling_law=law, seed=100 + k)
            df.to_csv(out / f"{case.tag}.csv", index=False)
            print(f"{case.tag}: {len(df)} rows (condenser) -> {(out / f'{case.tag}.csv').relative_to(here.parent)}")
            continue
        if getattr(case, "kind", None) == "air cooler":
            df = generate_air(case.exchanger, case.service, start="2031-01-01", hours=8760, fouling_law=law,
                              seed=100 + k, number=case.tag.split("-")[-1])
        else:
            df = generate(case.exchanger, case.service, start="2031-01-01", hours=8760, fouling_law=law,
                          seed=100 + k)
        path = out / f"{case.tag}.csv"
        df.to_csv(path, index=False)
        print(f"{case.tag}: {len(df)} rows, Rf {df['rf_true'].iloc[0]:.2e} -> {df['rf_true'].iloc[-1]:.2e} m2K/W "
              f"({type(law).__name__}) -> {path.relative_to(here.parent)}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
