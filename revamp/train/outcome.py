"""Assembling a solved train's result: the exchangers', streams' and points' tables, the limits, the furnace duty.

:func:`~revamp.train.solver.solve` hands over the port temperatures it solved and the exchangers' ratings of the
flattened cases; this module cuts the finite-difference probes off those ratings, brings them back to the train's
case shape, and builds the :class:`~revamp.train.result.TrainResult` (NaN for failed cases, never a silent number).
:func:`enthalpy_change` (a stream's ``m·∫cp dT``) lives here too: the rundown trim and the furnace duty use it.

References
----------
Kays, W. M., London, A. L. (1984). *Compact Heat Exchangers*, 3rd ed., McGraw-Hill (effectiveness-NTU).
"""
from __future__ import annotations

import dataclasses

import numpy as np
import pandas as pd

from ..errors import InputError
from ..rating_result import LazyResistances
from ..service import Service
from .hydraulics import pump_available
from .result import LimitCheck, TrainResult

__all__ = ["enthalpy_change"]

_SIDES = ("shell", "tube")

# Gauss-Legendre nodes and weights on [-1, 1], 4 points (exact for cp polynomial up to degree 7)
_GL_X, _GL_W = np.polynomial.legendre.leggauss(4)


def enthalpy_change(fluid, flow, t_from, t_to, field="stream"):
    """Heat taken up by a stream between two temperatures, ``m·∫cp dT`` [W] (negative when it cools).

    Parameters
    ----------
    fluid : Fluid
    flow : float or ndarray
        Mass flow [kg/s].
    t_from, t_to : float or ndarray
        Temperatures [K].
    field : str
        Path named when a temperature is outside the fluid's range.

    Notes
    -----
    Four-point Gauss-Legendre quadrature of the fluid's heat capacity.
    """
    t_from, t_to = np.asarray(t_from, float), np.asarray(t_to, float)
    half, mid = 0.5 * (t_to - t_from), 0.5 * (t_to + t_from)
    total = 0.0
    for x, w in zip(_GL_X, _GL_W):
        T = mid + half * x
        ok = np.isfinite(T)
        try:
            cp = fluid.props(np.where(ok, T, fluid.t_min if np.isfinite(fluid.t_min) else 300.0)).heat_capacity
        except InputError as exc:
            raise InputError(field, f"{fluid.name} between {np.nanmin(t_from):.1f} and {np.nanmax(t_to):.1f} K",
                             f"within the fluid's range {fluid.t_min:.1f}..{fluid.t_max:.1f} K ({exc.allowed})") \
                from None
        total = total + w * np.where(ok, cp, np.nan)
    return np.asarray(flow, float) * half * total


def _strip_probes(ratings, n):
    """The base block of ratings made with probes (the first ``n`` cases)."""
    out = {}
    for tag, r in ratings.items():
        if np.size(r.duty) == n:
            out[tag] = r
            continue
        if hasattr(r, "C_air"):
            out[tag] = _cut_air(r, slice(0, n))
            continue
        from ..rating import _SCALAR_FIELDS

        changes = {name: np.asarray(getattr(r, name))[:n] for name in _SCALAR_FIELDS}
        changes["resistances"] = r.resistances.iloc[:n].reset_index(drop=True)
        for name in ("tube_side", "shell_side"):  # the correlation details: their per-case arrays cut the same way
            detail = getattr(r, name)
            if dataclasses.is_dataclass(detail):
                cut = {f.name: getattr(detail, f.name)[:n] for f in dataclasses.fields(detail)
                       if isinstance(getattr(detail, f.name), np.ndarray) and getattr(detail, f.name).shape[:1] == (3 * n,)}
                changes[name] = dataclasses.replace(detail, **cut)
        svc = r.service
        changes["service"] = Service(
            shell=svc.shell.replace(flow=np.asarray(svc.shell.flow)[:n], t_in=np.asarray(svc.shell.t_in)[:n]),
            tube=svc.tube.replace(flow=np.asarray(svc.tube.flow)[:n], t_in=np.asarray(svc.tube.t_in)[:n]),
            fouling_shell=np.asarray(svc.fouling_shell)[:n], fouling_tube=np.asarray(svc.fouling_tube)[:n])
        out[tag] = dataclasses.replace(r, **changes)
    return out


def _cut_air(r, cut):
    """An air cooler's rating of the flattened cases restricted to ``cut`` (a slice), its service and details too."""
    changes = {name: np.asarray(getattr(r, name))[cut] for name in r._FRAME_FIELDS}
    changes["resistances"] = r.resistances.iloc[cut].reset_index(drop=True)
    detail = r.tube_side
    if dataclasses.is_dataclass(detail):
        size = np.size(r.duty)
        changes["tube_side"] = dataclasses.replace(detail, **{
            f.name: getattr(detail, f.name)[cut] for f in dataclasses.fields(detail)
            if isinstance(getattr(detail, f.name), np.ndarray) and getattr(detail, f.name).shape[:1] == (size,)})
    svc = r.service

    def part(v):
        return None if v is None else np.broadcast_to(np.asarray(v, float), np.shape(r.duty))[cut]

    changes["service"] = svc.replace(tube=svc.tube.replace(flow=part(svc.tube.flow), t_in=part(svc.tube.t_in)),
                                     air_in=part(svc.air_in), air_flow=part(svc.air_flow),
                                     face_velocity=part(svc.face_velocity), fouling_tube=part(svc.fouling_tube),
                                     fouling_air=part(svc.fouling_air))
    return dataclasses.replace(r, **changes)


def _reshape_air(r, shape):
    """An air cooler's rating of the flattened cases brought back to the train's case shape."""
    if shape != ():
        return dataclasses.replace(r, **{name: np.asarray(getattr(r, name), float).reshape(shape)
                                         for name in r._FRAME_FIELDS})
    one = _cut_air(r, slice(0, 1))
    changes = {name: float(np.asarray(getattr(one, name), float)[0]) for name in r._FRAME_FIELDS}
    res = one.resistances
    changes["resistances"] = pd.Series(res.to_numpy(float)[0], index=list(res.columns), name="resistance [m²K/W]")
    svc = one.service
    first = lambda v: None if v is None else float(np.ravel(v)[0])  # noqa: E731
    changes["service"] = svc.replace(tube=svc.tube.replace(flow=first(svc.tube.flow), t_in=first(svc.tube.t_in)),
                                     air_in=first(svc.air_in), air_flow=first(svc.air_flow),
                                     face_velocity=first(svc.face_velocity), fouling_tube=first(svc.fouling_tube),
                                     fouling_air=first(svc.fouling_air))
    return dataclasses.replace(one, **changes)


# ------------------------------------------------------------------------------------------------------ the result
def _reshape_rating(r, shape, ncase):
    """A rating of the flattened cases brought back to the train's case shape (scalars for one case)."""
    if hasattr(r, "C_air"):
        return _reshape_air(r, shape)
    from ..rating import _SCALAR_FIELDS

    if shape == () and isinstance(r.duty, float):  # rated on floats already (one case's closing pass)
        return r
    if shape != () and np.shape(r.duty) == shape:  # a one-dimensional sweep: its flattened cases are its shape
        return r
    changes = {}
    for name in _SCALAR_FIELDS:
        v = np.asarray(getattr(r, name), float).reshape(shape)
        changes[name] = float(v) if shape == () else v
    if shape == ():
        lazy = r.__dict__.get("_resistance_values") if "resistances" not in r.__dict__ else None
        if lazy is not None:  # not built yet: the one case's values, still built only when asked for
            changes["resistances"] = LazyResistances(lazy.layers, tuple(np.asarray(v, float)[:1] for v in lazy.values),
                                                     None, scalar=True)
        else:
            res = r.resistances
            changes["resistances"] = pd.Series(res.to_numpy(float)[0], index=list(res.columns),
                                               name="resistance [m²K/W]")
        svc = r.service
        changes["service"] = svc.replace(
            shell=svc.shell.replace(flow=float(svc.shell.flow[0]), t_in=float(svc.shell.t_in[0])),
            tube=svc.tube.replace(flow=float(svc.tube.flow[0]), t_in=float(svc.tube.t_in[0])),
            fouling_shell=float(np.ravel(svc.fouling_shell)[0]), fouling_tube=float(np.ravel(svc.fouling_tube)[0]))
    return dataclasses.replace(r, **changes)


def _out(v, shape):
    v = np.asarray(v, float).reshape(shape)
    return float(v) if shape == () else v


def _frame(rows, shape, index_name):
    """A DataFrame with one row per item (one case) or per (item, case) (sweeps)."""
    if shape == ():  # the numbers as one float block, the text columns inserted at their places
        names = list(dict.fromkeys(c for cols in rows.values() for c in cols))
        values = {c: [(v.ravel()[0] if isinstance(v, np.ndarray) else v)
                      for v in (cols.get(c, np.nan) for cols in rows.values())] for c in names}
        numeric = [c for c in names if all(isinstance(v, (float, int, np.floating)) and not isinstance(v, bool)
                                           for v in values[c])]
        frame = pd.DataFrame(np.array([values[c] for c in numeric], dtype=float).T.reshape(len(rows), len(numeric)),
                             index=pd.Index(list(rows), name=index_name), columns=numeric)
        for j, c in enumerate(names):
            if c not in frame.columns:
                frame.insert(j, c, values[c])
        return frame
    ncase = int(np.prod(shape, dtype=int))
    names = list(dict.fromkeys(c for cols in rows.values() for c in cols))
    data = {}
    for c in names:  # each column at once over all items: numbers as one float array, text as one object array
        vals = [cols.get(c, np.nan) for cols in rows.values()]
        if all(isinstance(v, np.ndarray) and v.dtype.kind == "f" or isinstance(v, float) for v in vals):
            data[c] = np.concatenate([np.broadcast_to(np.asarray(v, float), (ncase,)) for v in vals])
        elif not any(isinstance(v, np.ndarray) for v in vals):  # one value per item (a stream's name)
            items = np.empty(len(vals), dtype=object)
            items[:] = vals
            data[c] = np.repeat(items, ncase)
        else:
            data[c] = [w for v in vals for w in (list(np.broadcast_to(v, (ncase,))) if isinstance(v, np.ndarray)
                                                 else [v] * ncase)]
    # the (item, case) index from its levels and codes: what MultiIndex.from_product builds, without factorizing
    index = pd.MultiIndex(levels=[pd.Index(list(rows)), pd.RangeIndex(ncase)],
                          codes=[np.repeat(np.arange(len(rows)), ncase), np.tile(np.arange(ncase), len(rows))],
                          names=[index_name, "case"], verify_integrity=False)
    return pd.DataFrame(data, index=index)


def _result(plan, x, ratings, converged, failed, residual, iterations, tol):
    train, shape, nc = plan.train, plan.shape, plan.ncase
    warnings = []
    nan = np.where(failed, np.nan, 0.0)  # NaN for failed cases: never a silent number
    if shape == ():  # one case: the table takes floats
        nan0 = float(nan[0])

        def cases(v):
            return float(np.ravel(v)[0]) + nan0
    else:
        def cases(v):
            return np.broadcast_to(np.asarray(v, float), (nc,)) + nan

    def dp_of(tag, side):
        return getattr(ratings[tag], f"dp_{side}")

    _, point_exprs, final_exprs, stream_dp = plan.walk(x, dp_of)
    finals = {s: e.value(x) + nan for s, e in final_exprs.items()}

    # exchangers
    rows = {}
    for tag, m in train.exchangers.items():
        r = ratings[tag]
        if m.is_air_cooler:  # the air is no stream: its own columns, the shell ones left empty (NaN)
            svc = r.service
            row = {"shell_stream": "", "tube_stream": m.tube, "kind": "air cooler"}
            for col, v in (("duty", r.duty), ("t_in_air", svc.air_in), ("t_out_air", r.t_out_air),
                           ("t_in_tube", svc.tube.t_in), ("t_out_tube", r.t_out_tube), ("flow_air", r.air_flow),
                           ("flow_tube", svc.tube.flow), ("effectiveness", r.effectiveness), ("U_clean", r.U_clean),
                           ("U_service", r.U_service), ("fouling_air", svc.fouling_air),
                           ("fouling_tube", svc.fouling_tube), ("dp_air", r.dp_air), ("dp_tube", r.dp_tube),
                           ("velocity_tube", r.velocity_tube), ("velocity_face", r.velocity_face),
                           ("fan_power", r.fan_power)):
                row[col] = cases(v)
            row["dp_max_tube"] = np.nan if m.dp_max_tube is None else m.dp_max_tube
            rows[tag] = row
            warnings += [f"{tag}: {w}" for w in r.warnings]
            continue
        row = {"shell_stream": m.shell, "tube_stream": m.tube}
        for col, v in (("duty", r.duty), ("t_in_shell", r.service.shell.t_in), ("t_out_shell", r.t_out_shell),
                       ("t_in_tube", r.service.tube.t_in), ("t_out_tube", r.t_out_tube),
                       ("flow_shell", r.service.shell.flow), ("flow_tube", r.service.tube.flow),
                       ("effectiveness", r.effectiveness), ("U_clean", r.U_clean), ("U_service", r.U_service),
                       ("fouling_shell", r.service.fouling_shell), ("fouling_tube", r.service.fouling_tube),
                       ("dp_shell", r.dp_shell), ("dp_tube", r.dp_tube), ("velocity_tube", r.velocity_tube),
                       ("velocity_shell", r.velocity_shell)):
            row[col] = cases(v)
        row["dp_max_shell"] = np.nan if m.dp_max_shell is None else m.dp_max_shell
        row["dp_max_tube"] = np.nan if m.dp_max_tube is None else m.dp_max_tube
        rows[tag] = row
        warnings += [f"{tag}: {w}" for w in r.warnings]
    exchangers = _frame(rows, shape, "tag")

    # streams: final temperature, heat exchanged, pressure drop, rundown and trim cooler
    srows, limits = {}, []
    for s, st in train.streams.items():
        exchanged = 0.0
        for tag, m in train.exchangers.items():
            for side in _SIDES:
                if getattr(m, side) == s:
                    r = ratings[tag]
                    t_in = getattr(r.service, side).t_in
                    exchanged = exchanged + getattr(r, f"C_{side}") * (getattr(r, f"t_out_{side}") - t_in)
        row = {"supply": plan.supply[s], "final": finals[s], "flow": plan.flow[s],
               "duty": np.broadcast_to(np.asarray(exchanged, float), (nc,)) + nan,
               "dp": np.broadcast_to(np.asarray(stream_dp[s], float), (nc,)) + nan,
               "dp_max": train.dp_max.get(s, np.nan), "rundown": train.rundown.get(s, np.nan)}
        trim = np.zeros(nc)
        if s in train.rundown:
            limit = train.rundown[s]
            over = finals[s] > limit
            if np.any(over):
                trim = np.where(over, -enthalpy_change(st.fluid, plan.flow[s], finals[s], limit,
                                                       f"rundown[{s!r}]"), 0.0)
        row["trim_duty"] = trim + nan
        srows[s] = row
        if s in train.dp_max:
            limits.append(LimitCheck.of(f"{s} pressure drop", "dp", row["dp"], high=train.dp_max[s], shape=shape))
        if s in train.pump_curves:  # the route against the stream's pump (revamp.train.hydraulics)
            avail, _, pump_warn = pump_available(train.pump_curves[s], st.fluid, plan.flow[s], plan.supply[s], s)
            row["pump_dp"] = avail + nan
            warnings += pump_warn
            limits.append(LimitCheck.of(f"{s} pump", "dp", row["dp"], high=row["pump_dp"], shape=shape))
    for tag, m in train.exchangers.items():
        for side in _SIDES:
            lim = getattr(m, f"dp_max_{side}")
            if lim is not None:
                limits.append(LimitCheck.of(f"{tag} dp_{side}", "dp", rows[tag][f"dp_{side}"], high=lim, shape=shape))

    # points
    prow = {}
    for name, expr in point_exprs.items():
        stream, pt = train.points[name]
        t = expr.value(x) + nan
        prow[name] = {"stream": stream, "temperature": t, "t_min": np.nan if pt.t_min is None else pt.t_min,
                      "t_max": np.nan if pt.t_max is None else pt.t_max}
        if pt.t_min is not None or pt.t_max is not None:
            limits.append(LimitCheck.of(f"{name} temperature", "temperature", t, low=pt.t_min, high=pt.t_max,
                                        shape=shape))

    # furnace
    f_in = f_abs = f_fired = None
    if train.furnace is not None:
        fu = train.furnace
        st = train.streams[fu.stream]
        f_in = finals[fu.stream]
        f_abs = enthalpy_change(st.fluid, plan.flow[fu.stream], f_in, fu.outlet, "furnace.outlet")
        f_fired = f_abs / fu.efficiency
        if np.any(f_in > fu.outlet):
            warnings.append(f"furnace: the {fu.stream} reaches the furnace above its outlet temperature in "
                            f"{int(np.sum(f_in > fu.outlet))} case(s): the absorbed duty is negative there")
        if fu.max_duty is not None:
            limits.append(LimitCheck.of("furnace duty", "power", f_fired, high=fu.max_duty, shape=shape))
        f_in, f_abs, f_fired = (_out(v, shape) for v in (f_in, f_abs, f_fired))

    if np.any(failed):
        warnings.insert(0, f"train: {int(np.sum(failed))} case(s) failed (a stream left its fluid's range or a "
                           "rating had no solution): their results are NaN")
    not_conv = ~converged & ~failed
    if np.any(not_conv):
        warnings.insert(0, f"train: {int(np.sum(not_conv))} case(s) did not converge in {iterations} iterations "
                           f"(largest inlet change {np.nanmax(residual[not_conv]):.3g} K > {tol:g} K; where a "
                           "rating reports a correlation changing form near its flow, the train has no exact "
                           "solution there): see converged and residual")
    violated = [c.name for c in limits if not np.all(c.ok)]
    return TrainResult(
        train=train, shape=shape, exchangers=exchangers, streams=_frame(srows, shape, "stream"),
        points=_frame(prow, shape, "point") if prow else pd.DataFrame(
            columns=["stream", "temperature", "t_min", "t_max"]).rename_axis("point"),
        limits=tuple(limits), ratings={t: _reshape_rating(r, shape, nc) for t, r in ratings.items()},
        furnace_inlet=f_in, furnace_absorbed=f_abs, furnace_duty=f_fired,
        converged=bool(converged[0]) if shape == () else converged.reshape(shape), iterations=iterations,
        residual=float(residual[0]) if shape == () else residual.reshape(shape),
        final_temperatures={s: _out(v, shape) for s, v in finals.items()},
        violated=tuple(violated), warnings=tuple(dict.fromkeys(warnings)))
