"""Interactive controls for JupyterLab (ipywidgets): re-rate and redraw in place; static stand-ins for reports."""
from __future__ import annotations

from .case import breakdown_figure, ratings_table
from .pages import esc


def widgets_available() -> bool:
    """Whether ipywidgets can be imported (the notebooks fall back to static output otherwise)."""
    try:
        import ipywidgets  # noqa: F401
    except ImportError:
        return False
    return True


def what_if(case, throughput=1.0, fouling_shell=None, fouling_tube=None, twist_ratio=4.0, shells=None) -> dict:
    """Re-rate one exchanger at a throughput factor and fouling, as is, with twisted tapes and with N shells.

    Returns ``{label: Rating}``; used by the notebooks' widgets (a few ratings: well under 100 ms on the demo).
    """
    import revamp as rv

    from ..options import TwistedTape

    svc = case.service.scaled(throughput=throughput)
    changes = {}
    if fouling_shell is not None:
        changes["fouling_shell"] = fouling_shell
    if fouling_tube is not None:
        changes["fouling_tube"] = fouling_tube
    svc = svc.replace(**changes) if changes else svc
    ex = case.exchanger
    out = {"as is": rv.rate(ex, svc)}
    tape = TwistedTape(twist_ratio=twist_ratio)
    out[f"twisted tape y={twist_ratio:g}"] = rv.rate(*tape.apply(ex, svc))
    n = int(shells or ex.shells)
    if n != ex.shells:
        out[f"{n} shell(s) in series"] = rv.rate(ex.replace(shells=n), svc)
    return out


def what_if_widget(case, system: str = "SI"):
    """ipywidgets controls (throughput, fouling on each side, twist ratio, shells) that re-rate and redraw in place."""
    import ipywidgets as w
    from IPython.display import display

    f_s, f_t = float(case.service.fouling_shell), float(case.service.fouling_tube)
    slider = dict(continuous_update=False, style={"description_width": "11em"}, layout=w.Layout(width="32em"))
    controls = {
        "throughput": w.FloatSlider(value=case.throughput, min=0.6, max=1.6, step=0.05,
                                    description="throughput factor", **slider),
        "fouling_shell": w.FloatSlider(value=f_s * 1e4, min=0, max=max(10.0, 3 * f_s * 1e4), step=0.25,
                                       description="shell fouling [1e-4 m²K/W]", **slider),
        "fouling_tube": w.FloatSlider(value=f_t * 1e4, min=0, max=max(10.0, 3 * f_t * 1e4), step=0.25,
                                      description="tube fouling [1e-4 m²K/W]", **slider),
        "twist_ratio": w.FloatSlider(value=4.0, min=2.5, max=10, step=0.5, description="twist ratio y", **slider),
        "shells": w.IntSlider(value=int(case.exchanger.shells), min=1, max=4, description="shells in series",
                              **slider),
    }
    table, plot, status = w.HTML(), w.Output(), w.HTML()

    def redraw(_=None):
        import time

        start = time.perf_counter()
        try:
            ratings = what_if(case, controls["throughput"].value, controls["fouling_shell"].value * 1e-4,
                              controls["fouling_tube"].value * 1e-4, controls["twist_ratio"].value,
                              controls["shells"].value)
        except Exception as exc:  # an infeasible setting: say why, keep the last picture
            status.value = f"<p class='rv-status-failed'>{esc(exc)}</p>"
            return
        table.value = ratings_table(ratings, system).to_html(escape=True, border=0)
        with plot:
            plot.clear_output(wait=True)
            breakdown_figure(ratings).show()
        status.value = f"<small>re-rated in {1e3 * (time.perf_counter() - start):.0f} ms</small>"

    for c in controls.values():
        c.observe(redraw, names="value")
    box = w.VBox([w.HTML(f"<b>What if: {esc(case.tag)}</b>"), *controls.values(), status, table, plot])
    redraw()
    display(box)
    return box


def primer_table(rating):
    """The five resistances of one rating: value, share, and the U they give (outside-area basis)."""
    import pandas as pd

    r = rating.resistances
    total = float(r.sum())
    return pd.DataFrame({"resistance [10⁻⁴ m²·K/W]": (r * 1e4).round(3), "share of 1/U [%]": (100 * r / total).round(1),
                         "U if this one were zero [W/m²·K]": [round(1.0 / (total - float(v)), 0) for v in r]},
                        index=list(r.index))


def _primer_u(rating, scale_h_shell=1.0, scale_h_tube=1.0, fouling_shell=None, fouling_tube=None,
              wall_factor=1.0) -> dict:
    """The five resistances after scaling the films and setting the fouling (wall conductivity × ``wall_factor``)."""
    r = rating.resistances.astype(float).copy()
    ex = rating.exchanger
    ratio = ex.tube_od / ex.tube_id
    r["shell film"] = r["shell film"] / scale_h_shell
    r["tube film"] = r["tube film"] / scale_h_tube
    if fouling_shell is not None:
        r["shell fouling"] = fouling_shell
    if fouling_tube is not None:
        r["tube fouling"] = fouling_tube * ratio
    r["wall"] = r["wall"] / wall_factor
    return r


def primer_sweep(rating):
    """U as each resistance alone is halved, and as it is doubled (static stand-in for the widgets)."""
    import pandas as pd

    base = float(rating.resistances.sum())
    rows = {}
    for name in rating.resistances.index:
        r = float(rating.resistances[name])
        rows[name] = {"U as is [W/m²·K]": round(1 / base, 1), "U, this one halved": round(1 / (base - r / 2), 1),
                      "U, this one doubled": round(1 / (base + r), 1)}
    return pd.DataFrame(rows).T


def primer_widget(rating):
    """Sliders for each resistance of one rating; the bar chart and U update in place."""
    import ipywidgets as w
    from IPython.display import display

    ratio = rating.exchanger.tube_od / rating.exchanger.tube_id
    fs = float(rating.resistances["shell fouling"])
    ft = float(rating.resistances["tube fouling"]) / ratio
    st = dict(continuous_update=False, style={"description_width": "14em"}, layout=w.Layout(width="34em"))
    c = {"scale_h_shell": w.FloatSlider(value=1, min=0.25, max=4, step=0.05, description="shell film h ×", **st),
         "scale_h_tube": w.FloatSlider(value=1, min=0.25, max=4, step=0.05, description="tube film h ×", **st),
         "fouling_shell": w.FloatSlider(value=fs * 1e4, min=0, max=max(10, 3 * fs * 1e4), step=0.25,
                                        description="shell fouling [1e-4 m²K/W]", **st),
         "fouling_tube": w.FloatSlider(value=ft * 1e4, min=0, max=max(10, 3 * ft * 1e4), step=0.25,
                                       description="tube fouling [1e-4 m²K/W]", **st),
         "wall_factor": w.FloatSlider(value=1, min=0.2, max=5, step=0.1, description="wall conductivity ×", **st)}
    out, label = w.Output(), w.HTML()

    def redraw(_=None):
        import plotly.graph_objects as go

        r = _primer_u(rating, c["scale_h_shell"].value, c["scale_h_tube"].value, c["fouling_shell"].value * 1e-4,
                      c["fouling_tube"].value * 1e-4, c["wall_factor"].value)
        label.value = (f"<b>U = {1 / float(r.sum()):.0f} W/m²·K</b> (as rated: {float(rating.U_service):.0f}); "
                       f"controlling: {esc(r.idxmax())}")
        fig = go.Figure(go.Bar(x=list(r.index), y=(r * 1e4).tolist()))
        fig.update_layout(yaxis_title="resistance [10⁻⁴ m²·K/W]", height=360, margin={"t": 20})
        with out:
            out.clear_output(wait=True)
            fig.show()

    for s in c.values():
        s.observe(redraw, names="value")
    box = w.VBox([*c.values(), label, out])
    redraw()
    display(box)
    return box
