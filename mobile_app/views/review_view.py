"""Review: submit the job in your name; a supervisor reads what fails or is open first (a reason
for each), then approves with their PIN or passphrase, or returns the job with a comment and PIN."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.screen import screen
from mobile_app.state.outbox import OutboxState
from mobile_app.state.review import Outcome, ReviewItem, ReviewState, check_first


def _item(item: ReviewItem, reasons: dict[str, str], editable: bool) -> ft.Control:
    """One thing to answer for, with the supervisor's reason for approving with it."""
    parts: list[ft.Control] = [
        ft.Text(item.kind.upper(), size=12, weight=ft.FontWeight.BOLD),
        ft.Text(item.what, size=14),
    ]
    if editable:

        def typed(e: ft.Event[ft.TextField]) -> None:
            reasons[item.key] = e.control.value or ""

        parts.append(ft.TextField(key=f"reason-{item.key}", label="Reason for approving with this",
                                  value=reasons.get(item.key, ""), multiline=True, min_lines=1,
                                  max_lines=4, on_change=typed))
    column = ft.Column(parts, spacing=4, tight=True, horizontal_alignment=ft.CrossAxisAlignment.STRETCH)
    return ft.Container(column, padding=10, border_radius=8,
                        border=ft.Border.all(1, ft.Colors.OUTLINE))


def build(shell: Any, job_id: str) -> ft.View:
    """The review screen of a job."""
    review = ReviewState(shell.store, int(job_id))
    status = review.status
    message = ft.Text("", size=15, key="review-message")

    def show(outcome: Outcome) -> None:
        if outcome.ok:
            shell.toast(outcome.message)
            shell.render()
        else:
            message.value = outcome.message
            message.color = ft.Colors.ERROR
            message.update()
            shell.toast(outcome.message)

    body: list[ft.Control] = [
        ft.Text(f"Status: {review.status_word}", size=20, weight=ft.FontWeight.BOLD, key="review-status"),
        ft.Text(review.summary(), size=16, key="review-summary"),
    ]
    if status == "draft":
        recorder = ft.TextField(key="recorder-name", label="Recorded by (your name)",
                                value=review.recorder_name)
        if review.comment:
            body.append(ft.Container(
                ft.Text(f"Returned with comment: {review.comment}", size=15, key="review-comment"),
                padding=12, border=ft.Border.all(2, ft.Colors.ERROR), border_radius=8))
        body += [
            ft.Text("When every circuit is walked, submit the job for a supervisor's review.", size=15),
            recorder,
            ft.FilledButton("Submit for review", icon=ft.Icons.SEND, height=48, key="submit-review",
                            on_click=lambda _e: show(review.submit(recorder.value or ""))),
        ]
    elif status == "approved":
        busy = ft.ProgressRing(visible=False, width=28, height=28, key="export-busy")

        async def export(_e: Any) -> None:
            busy.visible = True
            busy.update()
            problem = await OutboxState(shell.store).prepare_export()  # the browser loads the PDF's
            if problem:                                                # libraries on the first export
                busy.visible = False
                show(Outcome(False, problem))
                return

            def done() -> None:
                said = OutboxState(shell.store).export_job(int(job_id))
                shell.sync_soon()
                show(Outcome(not said.startswith("Not "), said))

            shell.page.run_thread(done)

        reason = ft.TextField(key="revision-reason", label="Reason for a new revision")
        by_name = ft.TextField(key="revision-by", label="Your name")

        def revise(_e: Any) -> None:
            outcome, new_id = review.open_revision(reason.value or "", by_name.value or "")
            if new_id is None:
                show(outcome)
            else:
                shell.toast(outcome.message)
                shell.go(f"/job/{new_id}")

        given = review.reasons_given()
        body.append(ft.Row([ft.Icon(ft.Icons.VERIFIED, size=28), ft.Text("Approved and locked.", size=16)]))
        if given:
            body.append(ft.Text("Approved with these, for the reasons given:", size=16,
                                weight=ft.FontWeight.BOLD, key="reasons-given"))
            body.extend(ft.Text(f"• {what} — {why}", size=14) for what, why in given)
        body += [
            ft.Row([
                ft.FilledButton("Export to outbox", icon=ft.Icons.OUTBOX, height=48,
                                key="export-job", on_click=export),
                busy,
            ], spacing=12),
            ft.Text("To change an approved job, open a new revision; this one stays as approved.",
                    size=14),
            reason,
            by_name,
            ft.OutlinedButton("Open new revision", icon=ft.Icons.EDIT_NOTE, height=48,
                              key="open-revision", on_click=revise),
        ]
    else:
        reasons: dict[str, str] = shell.session_value(f"review-reasons-{job_id}", dict)
        items = review.items()
        supervisor = ft.TextField(key="supervisor-name", label="Supervisor name")
        checking = ft.ProgressRing(visible=False, width=28, height=28, key="review-busy")

        async def approve(_e: Any) -> None:
            checking.visible = True
            checking.update()
            show(await review.approve_async(supervisor.value or "", pin.value or "", reasons))
            checking.visible = False
            checking.update()

        async def send_back(_e: Any) -> None:
            checking.visible = True
            checking.update()
            show(await review.return_to_draft_async(supervisor.value or "", comment.value or "",
                                                    pin.value or ""))
            checking.visible = False
            checking.update()

        pin = ft.TextField(key="supervisor-pin", label="PIN or passphrase", password=True,
                           can_reveal_password=True)
        comment = ft.TextField(key="return-comment", label="Comment (to return the job)",
                               multiline=True, min_lines=2)
        if items:
            body += [
                ft.Text(check_first(len(items)),
                        size=18, weight=ft.FontWeight.BOLD, key="review-items"),
                ft.Text("Approving with any of these needs your reason for each; it goes into the "
                        "record and the PDF. Or return the job to have them put right.", size=14),
                *(_item(item, reasons, True) for item in items),
            ]
        body += [
            ft.Text("Supervisor: approve with your PIN (or your passphrase if the office enrolled "
                    "you), or return the job with a comment.", size=15),
            supervisor,
            pin,
            ft.Row([ft.FilledButton("Approve", icon=ft.Icons.VERIFIED, height=48, key="approve",
                                    on_click=approve), checking], spacing=12),
            comment,
            ft.OutlinedButton("Return to draft", icon=ft.Icons.UNDO, height=48, key="return-draft",
                              on_click=send_back),
        ]
    body.append(message)
    history = review.history()
    if history:
        body.append(ft.Text("History", size=18, weight=ft.FontWeight.BOLD))
        body.extend(ft.Text(line, size=13) for line in history)
    return screen(f"/job/{job_id}/review", "Review", body, shell.go, back=f"/job/{job_id}")
