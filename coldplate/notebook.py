"""Results in notebooks and spreadsheets: ``Result`` and ``SizingResult`` get ``_repr_html_`` (the report's
summary as HTML, no scripts), ``to_dict()`` (the JSON object ``--format json`` prints) and ``to_frame()`` (a
pandas DataFrame, where pandas is installed: ``pip install "coldplate[frames]"``).

The result classes live below the reports in the layers (``tests/test_architecture.py``), so they cannot call
a formatter themselves; this module, at the API layer, attaches the methods to them (:func:`install`).  The
API functions (``coldplate.check_file``, ``solve``, ``size_file``) install them before they return; importing
this module installs them too, for results made by the lower layers' own functions.
"""
from __future__ import annotations

def _pandas():
    try:
        import pandas
    except ImportError:
        raise ImportError("to_frame() needs pandas: pip install \"coldplate[frames]\" (or pandas)") from None
    return pandas


def result_html(self) -> str:
    """The report's summary: title, job line, results and findings (SI units)."""
    from coldplate._version import __version__
    from reports.content import summary
    from reports.html import render_summary_html

    return render_summary_html(*summary(self), __version__)


def result_dict(self) -> dict:
    """The JSON object of ``coldplate check --format json`` (SI, the unit in each key's name)."""
    from coldplate._version import __version__
    from reports.jsonout import check_to_dict

    return check_to_dict(self, __version__)


def result_frame(self, what: str = "profile", flows=None):
    """A pandas DataFrame: ``"profile"``, temperatures along the flow (x, water, plate top; °C); ``"curves"``,
    thermal resistance and pressure drop against flow with the fitted curves (``flows`` in m³/s, default the
    span ``coldplate curves`` uses)."""
    pd = _pandas()
    if what == "profile":
        from reports.jsonout import result_to_dict

        return pd.DataFrame(result_to_dict(self)["profile"])
    if what == "curves":
        from coldplate.plate.curves import default_flows, fit_flow_curves, flow_curve
        from reports.curves_out import curve_rows

        curve = flow_curve(self.design, flows or default_flows(self.V_dot), load=self.load, flow=self.V_dot)
        return pd.DataFrame(curve_rows(curve, fit_flow_curves(curve)))
    raise ValueError(f"to_frame({what!r}): choose 'profile' or 'curves'")


def sizing_html(self) -> str:
    from coldplate._version import __version__
    from reports.sizing import render_sizing_html

    return render_sizing_html(self, __version__)


def sizing_dict(self) -> dict:
    """The JSON object of ``coldplate size --format json``."""
    from coldplate._version import __version__
    from reports.sizing import sizing_to_dict

    return sizing_to_dict(self, __version__)


def sizing_frame(self):
    """The trade-off front as a pandas DataFrame, one row a design (SI, as ``coldplate size --format csv``)."""
    from reports.sizing import front_rows

    return _pandas().DataFrame(front_rows(self))


def install() -> None:
    """Attach the methods to the result classes (idempotent)."""
    from coldplate.plate.result import Result
    from coldplate.sizing.recommend import SizingResult

    Result._repr_html_, Result.to_dict, Result.to_frame = result_html, result_dict, result_frame
    SizingResult._repr_html_, SizingResult.to_dict, SizingResult.to_frame = sizing_html, sizing_dict, sizing_frame


install()
