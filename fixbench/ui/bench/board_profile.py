"""The board profile editor, reachable from intake: per part of the family, the board's designator,
marking, voltage rating and package; the profile file shared between shops (import, export); and
photos of the board with each test point marked by one click.

Reads and writes go through :mod:`fixbench.workflows.board_profiles`, off the GUI thread.
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QAbstractTableModel, QBuffer, QByteArray, QModelIndex, QPointF, QRectF, Qt, Signal
from PySide6.QtGui import QImage, QPainter
from PySide6.QtWidgets import (QComboBox, QDialog, QFileDialog, QHBoxLayout, QHeaderView, QLabel,
                               QPushButton, QSizePolicy, QTableView, QVBoxLayout, QWidget)

from fixbench.knowledge.board import BoardError, PartEntry, read_marking
from fixbench.knowledge.model import KIND_VALUE_UNITS
from fixbench.physics.part_values import value_of
from fixbench.physics.ratings import parse_ratings
from fixbench.quantities import ReadingError, format_quantity
from fixbench.ui.bench.board_part import draw_mark, photo_pixmap, photo_rect, scaled_for_keeping
from fixbench.ui.bench.look import heading
from fixbench.ui.workers import run_in_background
from fixbench.workflows import board_profiles as boards

PART, TITLE, TYPICAL, DESIGNATOR, MARKED, RATED, PACKAGE = range(7)
HEADERS = ("Part", "What it is", "Typical", "Designator", "Marked", "Voltage rating", "Package")
EDITABLE = {DESIGNATOR: "designator", MARKED: "value", RATED: "rated", PACKAGE: "package"}
PHOTO_FILTER = "Photos (*.jpg *.jpeg *.png)"
PROFILE_FILTER = "Board profile (*.toml)"


class BoardPartsModel(QAbstractTableModel):
    """One row per part of the family; the board's four fields are edited in place."""

    def __init__(self, family, ratings_text: dict[str, str], parent=None) -> None:
        super().__init__(parent)
        self.family = family
        self.parts = list(family.parts)
        self.entries: dict[str, PartEntry] = {}
        self.problems: dict[str, str] = {}
        try:
            ratings = parse_ratings(ratings_text)
        except ReadingError:
            ratings = None
        self.typical = {p.id: self._typical(p, ratings) for p in self.parts}

    def _typical(self, part, ratings) -> str:
        unit = KIND_VALUE_UNITS.get(part.kind)
        if unit is None or part.value is None or ratings is None:
            return ""
        try:
            return format_quantity(value_of(part, ratings, self.family.design), unit)
        except ReadingError:
            return ""

    def set_entries(self, entries) -> None:
        self.beginResetModel()
        self.entries = {e.part: e for e in entries}
        self.problems = {}
        self.endResetModel()

    def rowCount(self, parent=QModelIndex()) -> int:
        return 0 if parent.isValid() else len(self.parts)

    def columnCount(self, parent=QModelIndex()) -> int:
        return 0 if parent.isValid() else len(HEADERS)

    def headerData(self, section, orientation, role=Qt.ItemDataRole.DisplayRole):
        if orientation == Qt.Orientation.Horizontal and role == Qt.ItemDataRole.DisplayRole:
            return HEADERS[section]
        return None

    def flags(self, index):
        base = super().flags(index)
        return base | Qt.ItemFlag.ItemIsEditable if index.column() in EDITABLE else base

    def data(self, index, role=Qt.ItemDataRole.DisplayRole):
        if not index.isValid():
            return None
        part = self.parts[index.row()]
        column = index.column()
        if role in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.EditRole):
            if column == PART:
                return part.id
            if column == TITLE:
                return part.title
            if column == TYPICAL:
                return self.typical[part.id]
            entry = self.entries.get(part.id)
            return getattr(entry, EDITABLE[column]) if entry else ""
        if role == Qt.ItemDataRole.ToolTipRole and part.id in self.problems:
            return self.problems[part.id]
        return None

    def setData(self, index, value, role=Qt.ItemDataRole.EditRole) -> bool:
        if role != Qt.ItemDataRole.EditRole or index.column() not in EDITABLE:
            return False
        part = self.parts[index.row()]
        entry = self.entries.get(part.id) or PartEntry(part.id)
        entry = PartEntry(**{**entry.__dict__, EDITABLE[index.column()]: str(value)})
        self.entries[part.id] = entry
        try:
            read_marking(part.kind, entry.value, entry.rated)
            self.problems.pop(part.id, None)
        except BoardError as err:
            self.problems[part.id] = str(err)
        self.dataChanged.emit(self.index(index.row(), 0), self.index(index.row(), len(HEADERS) - 1))
        return True

    def profile_entries(self) -> list[PartEntry]:
        return [e for e in self.entries.values() if not e.blank]


class PhotoMarker(QWidget):
    """A board photo; a click marks where the chosen test point is."""

    clicked = Signal(float, float)  # fractions of the photo's width and height

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.pixmap = None
        self.marks: dict[str, tuple[float, float]] = {}
        self.titles: dict[str, str] = {}
        self.setMinimumSize(320, 220)
        self.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Expanding)
        self.setCursor(Qt.CursorShape.CrossCursor)

    def show_photo(self, image: bytes | None, marks: dict[str, tuple[float, float]]) -> None:
        self.pixmap = photo_pixmap(image) if image else None
        self.marks = dict(marks)
        self.update()

    def area(self) -> QRectF:
        return photo_rect(self.pixmap, QRectF(self.rect())) if self.pixmap is not None else QRectF()

    def paintEvent(self, event) -> None:
        painter = QPainter(self)
        painter.setRenderHint(QPainter.RenderHint.Antialiasing)
        if self.pixmap is None:
            painter.drawText(self.rect(), Qt.AlignmentFlag.AlignCenter, "No photo yet: add one of the board")
            return
        area = self.area()
        painter.drawPixmap(area.toRect(), self.pixmap)
        for point, (x, y) in self.marks.items():
            draw_mark(painter, QPointF(area.x() + x * area.width(), area.y() + y * area.height()), 9,
                      self.titles.get(point, point))

    def mousePressEvent(self, event) -> None:
        area = self.area()
        pos = event.position()
        if self.pixmap is None or not area.contains(pos):
            return
        self.clicked.emit((pos.x() - area.x()) / area.width(), (pos.y() - area.y()) / area.height())


class BoardProfileDialog(QDialog):
    """The board of one unit model: its parts' designators and markings, and its photos."""

    def __init__(self, context, family, model: str, ratings_text: dict[str, str], parent=None) -> None:
        super().__init__(parent)
        self.context, self.family, self.model = context, family, " ".join(model.split())
        self.setWindowTitle(f"Board profile: {self.model}")
        self.resize(1100, 680)
        self.parts = BoardPartsModel(family, ratings_text, self)
        self.table = QTableView()
        self.table.setModel(self.parts)
        self.table.verticalHeader().setVisible(False)
        header = self.table.horizontalHeader()
        header.setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(MARKED, QHeaderView.ResizeMode.Stretch)
        self.message = QLabel()
        self.message.setWordWrap(True)
        self.photos = QComboBox()
        self.photos.currentIndexChanged.connect(self._photo_chosen)
        self.point = QComboBox()
        for point in family.test_points:
            self.point.addItem(point.title, point.id)
        self.marker = PhotoMarker()
        self.marker.titles = {p.id: p.title for p in family.test_points}
        self.marker.clicked.connect(self._mark)
        self._photos: list = []
        self.loaded = False

        import_button = QPushButton("Import file\u2026")
        import_button.setToolTip("Read a board profile another shop shared (TOML)")
        import_button.clicked.connect(self._ask_import)
        export_button = QPushButton("Export file\u2026")
        export_button.setToolTip("Write this profile as a file to share (TOML)")
        export_button.clicked.connect(self._ask_export)
        photo_button = QPushButton("Add photo\u2026")
        photo_button.clicked.connect(self._ask_photo)
        self.save_button = QPushButton("Keep the profile")
        self.save_button.setDefault(True)
        self.save_button.clicked.connect(self.save)
        cancel = QPushButton("Close without keeping")
        cancel.clicked.connect(self.reject)

        left = QVBoxLayout()
        left.addWidget(heading(f"{self.model}: the board's parts", factor=1.1))
        left.addWidget(QLabel("Type what the board in hand says; blank cells keep the family's typical "
                              "part. Markings as printed: 2M2, 2 x 2.2 Mohm, 22R 1W, 10 uF 400 V, T2A 250V."))
        left.addWidget(self.table, 1)
        files = QHBoxLayout()
        files.addWidget(import_button)
        files.addWidget(export_button)
        files.addStretch(1)
        left.addLayout(files)
        right = QVBoxLayout()
        right.addWidget(heading("Photos: click where the test point is", factor=1.1))
        pick = QHBoxLayout()
        pick.addWidget(self.photos, 1)
        pick.addWidget(photo_button)
        right.addLayout(pick)
        point_row = QHBoxLayout()
        point_row.addWidget(QLabel("Test point"))
        point_row.addWidget(self.point, 1)
        right.addLayout(point_row)
        right.addWidget(self.marker, 1)
        columns = QHBoxLayout()
        columns.addLayout(left, 3)
        columns.addLayout(right, 2)
        buttons = QHBoxLayout()
        buttons.addWidget(self.message, 1)
        buttons.addWidget(cancel)
        buttons.addWidget(self.save_button)
        layout = QVBoxLayout(self)
        layout.addLayout(columns, 1)
        layout.addLayout(buttons)
        self._load()

    # --- reading -----------------------------------------------------------------------------------

    def _load(self, selected: int | None = None) -> None:
        store, family, model = self.context.store, self.family, self.model

        def read():
            return boards.board_of_model(store, model, family.id), boards.board_photos(store, model, family.id)

        def shown(result) -> None:
            board, photos = result
            if not self.loaded:
                self.parts.set_entries(board.parts if board else ())
            self._photos = list(photos)
            self.photos.blockSignals(True)
            self.photos.clear()
            for i, photo in enumerate(photos, start=1):
                self.photos.addItem(f"Photo {i}{': ' + photo.title if photo.title else ''}", photo.id)
            self.photos.blockSignals(False)
            index = self.photos.findData(selected) if selected is not None else 0
            self.photos.setCurrentIndex(max(index, 0) if photos else -1)
            self._photo_chosen()
            self.loaded = True

        run_in_background(read, shown, self._failed)

    def _photo_chosen(self, *_args) -> None:
        photo = next((p for p in self._photos if p.id == self.photos.currentData()), None)
        self.marker.show_photo(photo.image if photo else None, photo.marks if photo else {})

    def _failed(self, err: Exception) -> None:
        self.message.setText(f"\u26a0 {err}")

    # --- writing -----------------------------------------------------------------------------------

    def save(self) -> None:
        if self.parts.problems:
            part, problem = next(iter(self.parts.problems.items()))
            self.message.setText(f"\u26a0 {part}: {problem}")
            return
        store, family, model, entries = self.context.store, self.family, self.model, self.parts.profile_entries()
        run_in_background(lambda: boards.keep_profile(store, family, model, entries),
                          lambda _board: self.accept(), self._failed)

    def import_from(self, path: str) -> None:
        try:
            text = Path(path).read_text(encoding="utf-8-sig")
        except (OSError, UnicodeDecodeError) as err:
            self.message.setText(f"\u26a0 cannot read {path}: {err}")
            return
        store, family, model = self.context.store, self.family, self.model

        def done(board) -> None:
            self.parts.set_entries(board.parts)
            self.message.setText(f"Imported {len(board.parts)} parts from {Path(path).name}.")

        run_in_background(lambda: boards.import_profile(store, family, model, text), done, self._failed)

    def export_to(self, path: str) -> None:
        """Write what the table shows (kept or not yet) as the shared file."""
        entries = self.parts.profile_entries()
        board = boards.BoardProfile(self.model, self.family.id, tuple(sorted(entries, key=lambda e: e.part)))
        try:
            Path(path).write_text(boards.profile_to_toml(board), encoding="utf-8")
        except OSError as err:
            self.message.setText(f"\u26a0 cannot write {path}: {err.strerror or err}")
            return
        self.message.setText(f"Exported {len(entries)} parts to {Path(path).name}.")

    def add_photo_from(self, path: str) -> None:
        image = QImage(path)
        if image.isNull():
            self.message.setText(f"\u26a0 {Path(path).name} is not a photo this can read (JPEG or PNG)")
            return
        data = QByteArray()
        buffer = QBuffer(data)
        buffer.open(QBuffer.OpenModeFlag.WriteOnly)
        scaled_for_keeping(image).save(buffer, "JPEG", 85)
        buffer.close()
        image_bytes, title = bytes(data), Path(path).stem
        store, family, model = self.context.store, self.family, self.model
        run_in_background(lambda: boards.add_photo(store, family, model, image_bytes, title),
                          lambda photo_id: self._load(selected=photo_id), self._failed)

    def _mark(self, x: float, y: float) -> None:
        photo_id, point = self.photos.currentData(), self.point.currentData()
        if photo_id is None or point is None:
            return
        store, family = self.context.store, self.family
        run_in_background(lambda: boards.mark_point(store, family, photo_id, point, x, y),
                          lambda _none: self._load(selected=photo_id), self._failed)
        self.message.setText(f"Marked: {self.point.currentText()}.")

    def _ask_import(self) -> None:
        path, _ = QFileDialog.getOpenFileName(self, "Import a board profile", "", PROFILE_FILTER)
        if path:
            self.import_from(path)

    def _ask_export(self) -> None:
        name = "".join(c if c.isalnum() or c in "-_" else "_" for c in self.model) or "board"
        path, _ = QFileDialog.getSaveFileName(self, "Export the board profile", f"{name}.toml", PROFILE_FILTER)
        if path:
            self.export_to(path)

    def _ask_photo(self) -> None:
        path, _ = QFileDialog.getOpenFileName(self, "Add a photo of the board", "", PHOTO_FILTER)
        if path:
            self.add_photo_from(path)
