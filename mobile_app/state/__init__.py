"""Screen state of the field app: plain Python, no Flet.

Views read these objects and call their methods; every number, message and step rule lives here
(or below, in `mobile_app.sync`, `mobile_app.export`, `mobile_app.store` and `calc`), so the screens'
behaviour is testable without a browser.
"""

from mobile_app.state.chart import ChartModel, ChartSeries, chart_for
from mobile_app.state.fields import STEPS, Choice, FieldSpec, specs_for_step
from mobile_app.state.form import Form, FormField
from mobile_app.state.jobs import JobRow, JobScreen, JobsList
from mobile_app.state.library import CurveDraft
from mobile_app.state.records import BoardScreen, JobDetails, ObservationsScreen, Overall
from mobile_app.state.results import Cause, CheckRow, ResultsPanel, StepCard, results_panel
from mobile_app.state.review import ReviewState
from mobile_app.state.settings import SettingsState
from mobile_app.state.text import CAUTIONS, format_quantity, verdict_mark
from mobile_app.state.walk import FieldView, Walk

__all__ = [
    "CAUTIONS",
    "STEPS",
    "BoardScreen",
    "Cause",
    "ChartModel",
    "ChartSeries",
    "CheckRow",
    "Choice",
    "CurveDraft",
    "FieldSpec",
    "FieldView",
    "Form",
    "FormField",
    "JobDetails",
    "JobRow",
    "JobScreen",
    "JobsList",
    "ObservationsScreen",
    "Overall",
    "ResultsPanel",
    "ReviewState",
    "SettingsState",
    "StepCard",
    "Walk",
    "chart_for",
    "format_quantity",
    "results_panel",
    "specs_for_step",
    "verdict_mark",
]
