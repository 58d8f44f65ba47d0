"""Sending alerts to the growers by e-mail and text message."""

from __future__ import annotations

import smtplib
from dataclasses import dataclass, field
from datetime import datetime, timedelta
from email.message import EmailMessage

from .alerts import CRITICAL, Alert, format_alert


@dataclass
class Recipient:
    name: str
    email: str | None = None
    phone: str | None = None
    zone_ids: list[str] = field(default_factory=list)
    critical_only: bool = False


@dataclass
class Outbox:
    sent: list[tuple[str, str]] = field(default_factory=list)
    last_sent: dict[str, datetime] = field(default_factory=dict)


def recipients_for(alert: Alert, recipients: list[Recipient]) -> list[Recipient]:
    chosen = []
    for recipient in recipients:
        if recipient.zone_ids and alert.zone_id not in recipient.zone_ids:
            continue
        if recipient.critical_only and alert.level != CRITICAL:
            continue
        chosen.append(recipient)
    return chosen


def build_email(recipient: Recipient, alerts: list[Alert], sender: str) -> EmailMessage:
    message = EmailMessage()
    message["From"] = sender
    message["To"] = recipient.email or ""
    critical = sum(1 for alert in alerts if alert.level == CRITICAL)
    message["Subject"] = f"Fernhill: {len(alerts)} alerts ({critical} critical)"
    lines = [f"Hello {recipient.name},", ""]
    for alert in alerts:
        lines.append(format_alert(alert))
    message.set_content("\n".join(lines))
    return message


def should_send(outbox: Outbox, recipient: Recipient, now: datetime, quiet: timedelta) -> bool:
    last = outbox.last_sent.get(recipient.name)
    return last is None or now - last >= quiet


def notify(alerts: list[Alert], recipients: list[Recipient], outbox: Outbox, now: datetime,
           quiet: timedelta = timedelta(minutes=30)) -> int:
    by_recipient: dict[str, list[Alert]] = {}
    for alert in alerts:
        for recipient in recipients_for(alert, recipients):
            by_recipient.setdefault(recipient.name, []).append(alert)
    sent = 0
    for recipient in recipients:
        pending = by_recipient.get(recipient.name)
        if not pending or not should_send(outbox, recipient, now, quiet):
            continue
        summary = "; ".join(format_alert(alert) for alert in pending)
        outbox.sent.append((recipient.name, summary))
        outbox.last_sent[recipient.name] = now
        sent += 1
    return sent


def deliver(outbox: Outbox, recipients: list[Recipient], alerts: list[Alert], host: str, sender: str) -> None:
    with smtplib.SMTP(host) as connection:
        for recipient in recipients:
            if recipient.email is None:
                continue
            message = build_email(recipient, alerts, sender)
            connection.send_message(message)
