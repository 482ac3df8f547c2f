"""The shop's records as SQLAlchemy 2 typed mappings (the schema at the newest migration).

Times are naive UTC. Money is integer cents. Free text is ``Text`` so any length fits on both
SQLite and PostgreSQL. Engine identifiers (families, checks, faults, parts, stages) are plain
strings owned by the knowledge base; the store does not validate them against it.

``cases.top_suspect_fault``, ``cases.came_back``, ``cases.failed_verification``,
``cases.parts_cents`` and the ``confirmed_*`` columns are summaries kept by the store as cases are
written (see :mod:`fixbench.store.case_flags`), so the owner's figures are single indexed SQL
aggregates at 100,000 cases; readings, suspects, repairs, verifications and the warranty returns
linked to a case stay the full record they are derived from. Changing anything here needs a new
migration under ``migrations/``.

A customer's name and contact are personal data: they live in ``customers`` only, linked from the
case, so removing a person on request drops one row and keeps every job's figures.
"""

from __future__ import annotations

from datetime import datetime

from sqlalchemy import (JSON, Boolean, DateTime, Float, ForeignKey, Index, Integer, LargeBinary,
                        MetaData, String, Text, UniqueConstraint, false)
from sqlalchemy.orm import DeclarativeBase, Mapped, mapped_column, relationship

STATUSES = ("intake", "diagnosing", "repairing", "verifying", "closed")
OUTCOMES = ("repaired", "not_economical", "no_fault_found", "returned_unrepaired")
ROLES = ("technician", "trainee")
# Every column of ``cases`` the owner's figures read, in one covering index (migration 0007).
FIGURE_COLUMNS = ("status", "opened_at", "technician_id", "device_id", "family_id",
                  "confirmed_fault", "confirmed_part", "outcome", "came_back",
                  "failed_verification", "top_suspect_fault", "bench_minutes", "price_cents",
                  "parts_cents", "labour_rate_cents", "comeback_of_id", "closed_at")
REPAIR_KINDS = ("replaced", "tested")


# Named constraints, so SQLite batch migrations can find them again (alembic "batch" docs).
NAMING_CONVENTION = {
    "ix": "ix_%(column_0_label)s",
    "uq": "uq_%(table_name)s_%(column_0_name)s",
    "ck": "ck_%(table_name)s_%(constraint_name)s",
    "fk": "fk_%(table_name)s_%(column_0_name)s_%(referred_table_name)s",
    "pk": "pk_%(table_name)s",
}


class Base(DeclarativeBase):
    metadata = MetaData(naming_convention=NAMING_CONVENTION)


class Technician(Base):
    __tablename__ = "technicians"
    id: Mapped[int] = mapped_column(primary_key=True)
    name: Mapped[str] = mapped_column(Text)
    role: Mapped[str] = mapped_column(String(16), default="technician")
    active: Mapped[bool] = mapped_column(Boolean, default=True)


class Device(Base):
    __tablename__ = "devices"
    id: Mapped[int] = mapped_column(primary_key=True)
    make: Mapped[str] = mapped_column(Text)
    model: Mapped[str] = mapped_column(Text, index=True)
    kind: Mapped[str] = mapped_column(Text)
    label_ratings: Mapped[dict[str, str]] = mapped_column(JSON, default=dict)
    serial: Mapped[str | None] = mapped_column(Text)

    __table_args__ = (Index("ix_devices_serial", "serial"),)


class Customer(Base):
    """A person who brings units in: a name and how to reach them (both personal data)."""

    __tablename__ = "customers"
    id: Mapped[int] = mapped_column(primary_key=True)
    name: Mapped[str] = mapped_column(Text)
    contact: Mapped[str | None] = mapped_column(Text)
    added_at: Mapped[datetime] = mapped_column(DateTime)

    __table_args__ = (Index("ix_customers_name", "name"),)


class Case(Base):
    __tablename__ = "cases"
    id: Mapped[int] = mapped_column(primary_key=True)
    ticket_ref: Mapped[str] = mapped_column(Text, unique=True)
    customer_id: Mapped[int | None] = mapped_column(
        ForeignKey("customers.id", ondelete="SET NULL"))
    device_id: Mapped[int] = mapped_column(ForeignKey("devices.id"))
    technician_id: Mapped[int] = mapped_column(ForeignKey("technicians.id"))
    family_id: Mapped[str] = mapped_column(Text)
    ratings: Mapped[dict[str, str]] = mapped_column(JSON, default=dict)
    status: Mapped[str] = mapped_column(String(16), default="intake")
    outcome: Mapped[str | None] = mapped_column(String(32))
    opened_at: Mapped[datetime] = mapped_column(DateTime)
    closed_at: Mapped[datetime | None] = mapped_column(DateTime)
    bench_minutes: Mapped[int | None] = mapped_column(Integer)
    confirmed_fault: Mapped[str | None] = mapped_column(Text)
    confirmed_part: Mapped[str | None] = mapped_column(Text)
    confirmed_stage: Mapped[str | None] = mapped_column(Text)
    notes: Mapped[str] = mapped_column(Text, default="")
    top_suspect_fault: Mapped[str | None] = mapped_column(Text)
    # Repaired, and a later case was taken in as a warranty return of it (comeback_of_id).
    came_back: Mapped[bool] = mapped_column(Boolean, default=False, server_default=false())
    failed_verification: Mapped[bool] = mapped_column(Boolean, default=False,
                                                      server_default=false())
    # Money, in cents: the price quoted at intake and the final price at close; the parts fitted
    # (kept as repair lines are written); the labour rate per hour the job was closed at.
    quoted_cents: Mapped[int | None] = mapped_column(Integer)
    price_cents: Mapped[int | None] = mapped_column(Integer)
    parts_cents: Mapped[int] = mapped_column(Integer, default=0, server_default="0")
    labour_rate_cents: Mapped[int | None] = mapped_column(Integer)
    # This case is a warranty return of that earlier job (linked at intake).
    comeback_of_id: Mapped[int | None] = mapped_column(
        ForeignKey("cases.id", ondelete="SET NULL"))

    device: Mapped[Device] = relationship()
    technician: Mapped[Technician] = relationship()
    customer: Mapped[Customer | None] = relationship()
    readings: Mapped[list[ReadingRow]] = relationship(
        back_populates="case", order_by="ReadingRow.seq", cascade="all, delete-orphan",
        passive_deletes=True)

    __table_args__ = (
        Index("ix_cases_opened_at", "opened_at"),
        Index("ix_cases_closed_at", "closed_at"),
        Index("ix_cases_status", "status"),
        Index("ix_cases_outcome", "outcome"),
        Index("ix_cases_family_fault", "family_id", "confirmed_fault"),
        Index("ix_cases_technician", "technician_id", "bench_minutes"),
        Index("ix_cases_device_opened", "device_id", "opened_at"),
        Index("ix_cases_bench_minutes", "bench_minutes"),
        Index("ix_cases_confirmed_fault", "confirmed_fault"),
        Index("ix_cases_confirmed_part", "confirmed_part"),
        Index("ix_cases_confirmed_stage", "confirmed_stage"),
        # Covering indexes for the owner's figures (migration 0003 says why).
        Index("ix_cases_fig_technician", "status", "technician_id", "bench_minutes", "outcome",
              "came_back", "failed_verification", "opened_at"),
        Index("ix_cases_fig_minutes", "status", "bench_minutes", "opened_at"),
        Index("ix_cases_fig_family", "status", "family_id", "outcome", "opened_at"),
        Index("ix_cases_fig_fault", "status", "confirmed_fault", "outcome", "opened_at",
              "top_suspect_fault"),
        Index("ix_cases_fig_part", "status", "confirmed_part", "outcome", "opened_at"),
        Index("ix_cases_fig_stage", "status", "confirmed_stage", "outcome", "opened_at"),
        Index("ix_cases_fig_device", "status", "device_id", "outcome", "opened_at"),
        # Every figure's columns, warranty returns and customers (migration 0007 says why).
        Index("ix_cases_fig_all", *FIGURE_COLUMNS),
        Index("ix_cases_customer", "customer_id", "opened_at"),
        Index("ix_cases_comeback_of", "comeback_of_id"),
    )


class ReadingRow(Base):
    """One check as the technician typed it and as it was parsed (value in SI units)."""

    __tablename__ = "readings"
    id: Mapped[int] = mapped_column(primary_key=True)
    case_id: Mapped[int] = mapped_column(ForeignKey("cases.id", ondelete="CASCADE"))
    seq: Mapped[int] = mapped_column(Integer)
    check_id: Mapped[str] = mapped_column(Text)
    typed: Mapped[str] = mapped_column(Text)
    value: Mapped[float | None] = mapped_column(Float)
    unit: Mapped[str | None] = mapped_column(Text)
    outcome: Mapped[str | None] = mapped_column(Text)
    entered_at: Mapped[datetime] = mapped_column(DateTime)

    case: Mapped[Case] = relationship(back_populates="readings")
    suspects: Mapped[list[SuspectRow]] = relationship(
        order_by="SuspectRow.rank", cascade="all, delete-orphan", passive_deletes=True)

    __table_args__ = (UniqueConstraint("case_id", "seq", name="uq_readings_case_seq"),)


class SuspectRow(Base):
    """The engine's ranked suspects right after a reading (rank 1 is its first suspect)."""

    __tablename__ = "suspects"
    id: Mapped[int] = mapped_column(primary_key=True)
    reading_id: Mapped[int] = mapped_column(ForeignKey("readings.id", ondelete="CASCADE"))
    rank: Mapped[int] = mapped_column(Integer)
    fault_id: Mapped[str] = mapped_column(Text)
    part_id: Mapped[str | None] = mapped_column(Text)
    stage_id: Mapped[str | None] = mapped_column(Text)
    probability: Mapped[float] = mapped_column(Float)

    __table_args__ = (UniqueConstraint("reading_id", "rank", name="uq_suspects_reading_rank"),)


class RepairAction(Base):
    """A part replaced, or tested before power-up, on a case; ``note`` is free text."""

    __tablename__ = "repair_actions"
    id: Mapped[int] = mapped_column(primary_key=True)
    case_id: Mapped[int] = mapped_column(ForeignKey("cases.id", ondelete="CASCADE"), index=True)
    part_id: Mapped[str] = mapped_column(Text)
    fault_id: Mapped[str | None] = mapped_column(Text)
    action: Mapped[str] = mapped_column(String(16))
    parts_cost_cents: Mapped[int] = mapped_column(Integer, default=0)
    done_at: Mapped[datetime] = mapped_column(DateTime)
    note: Mapped[str] = mapped_column(Text, default="")
    # What went in for a replaced part, as the technician wrote it ("22 uF 50 V", a part number).
    value_fitted: Mapped[str | None] = mapped_column(Text)
    # A part tested before power-up: passed or failed. None for a replaced part, and for a tested
    # part kept before migration 0005, whose result was never recorded.
    test_passed: Mapped[bool | None] = mapped_column(Boolean)


class Verification(Base):
    """A reading taken after the repair to show the supply works (passed or not)."""

    __tablename__ = "verifications"
    id: Mapped[int] = mapped_column(primary_key=True)
    case_id: Mapped[int] = mapped_column(ForeignKey("cases.id", ondelete="CASCADE"), index=True)
    check_id: Mapped[str] = mapped_column(Text)
    typed: Mapped[str] = mapped_column(Text)
    value: Mapped[float | None] = mapped_column(Float)
    unit: Mapped[str | None] = mapped_column(Text)
    outcome: Mapped[str | None] = mapped_column(Text)
    passed: Mapped[bool] = mapped_column(Boolean)
    entered_at: Mapped[datetime] = mapped_column(DateTime)


class PracticeAttempt(Base):
    """One practice round: its scenario id (source, level, family, root fault, seed), how it went."""

    __tablename__ = "practice_attempts"
    id: Mapped[int] = mapped_column(primary_key=True)
    trainee_id: Mapped[int] = mapped_column(ForeignKey("technicians.id"), index=True)
    scenario: Mapped[str] = mapped_column(Text)
    checks_used: Mapped[int] = mapped_column(Integer)
    minutes: Mapped[float] = mapped_column(Float)
    score: Mapped[float] = mapped_column(Float)
    safety_slips: Mapped[int] = mapped_column(Integer, default=0)
    attempted_at: Mapped[datetime] = mapped_column(DateTime)
    coach_used: Mapped[bool] = mapped_column(Boolean, default=False, server_default=false())
    # The trainee blew the fuse on plain mains: that slip caps the round's band lowest.
    fuse_blown: Mapped[bool] = mapped_column(Boolean, default=False, server_default=false())
    # What the round taught (null for rounds kept before revision 0006): the verdict right, the
    # kinds of safety mistake (comma-separated, each once), checks that told nothing, and the
    # round's record (scenario, actions, diagnosis, readings) for opening its debrief again.
    fault_right: Mapped[bool | None] = mapped_column(Boolean, nullable=True)
    slip_kinds: Mapped[str | None] = mapped_column(Text, nullable=True)
    checks_wasted: Mapped[int | None] = mapped_column(Integer, nullable=True)
    record: Mapped[dict | None] = mapped_column(JSON(none_as_null=True), nullable=True)


class Amendment(Base):
    """A correction to a closed case: which field, its old and new value (JSON text), who, why."""

    __tablename__ = "amendments"
    id: Mapped[int] = mapped_column(primary_key=True)
    case_id: Mapped[int] = mapped_column(ForeignKey("cases.id", ondelete="CASCADE"), index=True)
    field: Mapped[str] = mapped_column(Text)
    old_value: Mapped[str] = mapped_column(Text)
    new_value: Mapped[str] = mapped_column(Text)
    amended_by: Mapped[str] = mapped_column(Text)
    amended_at: Mapped[datetime] = mapped_column(DateTime)
    reason: Mapped[str] = mapped_column(Text)


class OwnerSecret(Base):
    """The owner's passphrase as a salted scrypt hash with its cost parameters (one row)."""

    __tablename__ = "owner_secret"
    id: Mapped[int] = mapped_column(primary_key=True)
    salt: Mapped[bytes] = mapped_column(LargeBinary)
    n: Mapped[int] = mapped_column(Integer)
    r: Mapped[int] = mapped_column(Integer)
    p: Mapped[int] = mapped_column(Integer)
    digest: Mapped[bytes] = mapped_column(LargeBinary)
    set_at: Mapped[datetime] = mapped_column(DateTime)


# --- The bench's own record (migration 0004): undo, skips, caution acknowledgement, shop settings.


class ShopSetting(Base):
    """A shop-wide setting kept as text (the footer of the owner's reports, ...)."""

    __tablename__ = "shop_settings"
    key: Mapped[str] = mapped_column(String(64), primary_key=True)
    value: Mapped[str] = mapped_column(Text)


class WithdrawnReading(Base):
    """A reading the technician took back (undo): kept in the record, left out of the diagnosis."""

    __tablename__ = "withdrawn_readings"
    reading_id: Mapped[int] = mapped_column(ForeignKey("readings.id", ondelete="CASCADE"),
                                            primary_key=True)
    withdrawn_at: Mapped[datetime] = mapped_column(DateTime)


class SkippedCheck(Base):
    """A check the technician could not make on this unit ("cannot measure")."""

    __tablename__ = "skipped_checks"
    id: Mapped[int] = mapped_column(primary_key=True)
    case_id: Mapped[int] = mapped_column(ForeignKey("cases.id", ondelete="CASCADE"), index=True)
    check_id: Mapped[str] = mapped_column(Text)
    skipped_at: Mapped[datetime] = mapped_column(DateTime)


class CautionAcknowledgement(Base):
    """Who read and accepted the safety cautions of a case before it was powered, and when."""

    __tablename__ = "caution_acknowledgements"
    case_id: Mapped[int] = mapped_column(ForeignKey("cases.id", ondelete="CASCADE"),
                                         primary_key=True)
    technician_id: Mapped[int] = mapped_column(ForeignKey("technicians.id"))
    acknowledged_at: Mapped[datetime] = mapped_column(DateTime)


class BoardProfileRow(Base):
    """One unit model's board as the shop knows it, found again by the model text (migration 0008)."""

    __tablename__ = "board_profiles"
    id: Mapped[int] = mapped_column(primary_key=True)
    model: Mapped[str] = mapped_column(Text)  # as the shop typed it
    model_key: Mapped[str] = mapped_column(Text, unique=True)  # case-folded, spaces collapsed
    family_id: Mapped[str] = mapped_column(String(64))
    updated_at: Mapped[datetime] = mapped_column(DateTime)


class BoardPartRow(Base):
    """What the board's part playing one of the family's parts is called and marked with."""

    __tablename__ = "board_parts"
    profile_id: Mapped[int] = mapped_column(ForeignKey("board_profiles.id", ondelete="CASCADE"),
                                            primary_key=True)
    part_id: Mapped[str] = mapped_column(String(32), primary_key=True)
    designator: Mapped[str] = mapped_column(Text, server_default="")
    value: Mapped[str] = mapped_column(Text, server_default="")
    rated: Mapped[str] = mapped_column(Text, server_default="")
    package: Mapped[str] = mapped_column(Text, server_default="")


class BoardPhotoRow(Base):
    """A photo of a profile's board, kept in the database so backups carry it whole."""

    __tablename__ = "board_photos"
    id: Mapped[int] = mapped_column(primary_key=True)
    profile_id: Mapped[int] = mapped_column(ForeignKey("board_profiles.id", ondelete="CASCADE"),
                                            index=True)
    title: Mapped[str] = mapped_column(Text, server_default="")
    image: Mapped[bytes] = mapped_column(LargeBinary)
    sha256: Mapped[str] = mapped_column(String(64))
    added_at: Mapped[datetime] = mapped_column(DateTime)


class BoardPhotoMark(Base):
    """Where a test point is on a photo, as fractions (0-1) of its width and height."""

    __tablename__ = "board_photo_marks"
    photo_id: Mapped[int] = mapped_column(ForeignKey("board_photos.id", ondelete="CASCADE"),
                                          primary_key=True)
    point_id: Mapped[str] = mapped_column(String(64), primary_key=True)
    x: Mapped[float] = mapped_column(Float)
    y: Mapped[float] = mapped_column(Float)
