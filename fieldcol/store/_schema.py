"""The tables of schema version 1, as SQL.

Every synced table carries the same bookkeeping columns: a text UUID key (rows travel between
devices later, so integer keys would collide), UTC ISO 8601 timestamps, the device that made the
last change and a ``deleted_at`` tombstone (rows are never DELETEd, so a deletion can travel too).
CHECK constraints hold the closed vocabularies so that even a stray SQL write cannot store a code
or status the app does not know.
"""

from __future__ import annotations

CODES = ("aisc360-22", "en1993-1-1")
UNIT_SYSTEMS = ("us", "si")
SEVERITIES = ("info", "low", "medium", "high", "urgent")
FINDING_STATUSES = ("open", "closed")
RESTRAINT_KINDS = ("brace_added", "brace_removed", "cable_found", "end_condition_changed", "other")
AXES = ("strong", "weak", "twist")
RETROFIT_STATUSES = ("proposed", "chosen", "rejected", "built")
#: which part of a column a finding concerns (``all``: the whole column, every face)
FACES = ("all", "north", "east", "south", "west", "web", "base", "top")
FACE_WORDS = {"all": "all faces", "north": "north face", "east": "east face",
              "south": "south face", "west": "west face", "web": "web",
              "base": "base and base plate", "top": "top and cap"}

#: tables whose rows are records of the engineer's work (bookkeeping columns, tombstones)
DATA_TABLES = ("sites", "visits", "levels", "columns", "measurements", "restraint_changes",
               "findings", "photos", "photo_links", "checks", "retrofits")

_BOOK = """
    id TEXT PRIMARY KEY NOT NULL,
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    device_id TEXT NOT NULL,
    deleted_at TEXT"""


def _in(values: tuple[str, ...]) -> str:
    return "(" + ", ".join(f"'{v}'" for v in values) + ")"


V1_SQL = f"""
CREATE TABLE meta (
    key TEXT PRIMARY KEY NOT NULL,
    value TEXT NOT NULL
);
CREATE TABLE sites ({_BOOK},
    name TEXT NOT NULL CHECK (length(trim(name)) > 0),
    address TEXT,
    owner_ref TEXT,
    code TEXT NOT NULL CHECK (code IN {_in(CODES)}),
    unit_system TEXT NOT NULL CHECK (unit_system IN {_in(UNIT_SYSTEMS)}),
    notes TEXT
);
CREATE UNIQUE INDEX sites_live_name ON sites(name) WHERE deleted_at IS NULL;
CREATE TABLE visits ({_BOOK},
    site_id TEXT NOT NULL REFERENCES sites(id),
    date TEXT NOT NULL,
    who TEXT,
    notes TEXT
);
CREATE TABLE levels ({_BOOK},
    site_id TEXT NOT NULL REFERENCES sites(id),
    name TEXT NOT NULL CHECK (length(trim(name)) > 0),
    elevation TEXT
);
CREATE UNIQUE INDEX levels_live_name ON levels(site_id, name) WHERE deleted_at IS NULL;
CREATE TABLE columns ({_BOOK},
    site_id TEXT NOT NULL REFERENCES sites(id),
    tag TEXT NOT NULL CHECK (length(trim(tag)) > 0),
    location TEXT,
    level_id TEXT REFERENCES levels(id),
    grid TEXT,
    record TEXT NOT NULL CHECK (json_valid(record))
);
CREATE UNIQUE INDEX columns_live_tag ON columns(site_id, tag) WHERE deleted_at IS NULL;
CREATE TABLE measurements ({_BOOK},
    column_id TEXT NOT NULL REFERENCES columns(id),
    visit_id TEXT REFERENCES visits(id),
    quantity TEXT NOT NULL,
    kind TEXT NOT NULL,
    text TEXT NOT NULL,
    value REAL NOT NULL,
    unit TEXT NOT NULL,
    gauge TEXT,
    taken_by TEXT,
    taken_at TEXT NOT NULL,
    corrects TEXT REFERENCES measurements(id),
    note TEXT
);
CREATE TABLE restraint_changes ({_BOOK},
    column_id TEXT NOT NULL REFERENCES columns(id),
    date TEXT NOT NULL,
    kind TEXT NOT NULL CHECK (kind IN {_in(RESTRAINT_KINDS)}),
    axis TEXT CHECK (axis IS NULL OR axis IN {_in(AXES)}),
    description TEXT NOT NULL,
    seen_by TEXT,
    detail TEXT CHECK (detail IS NULL OR json_valid(detail))
);
CREATE TABLE findings ({_BOOK},
    site_id TEXT NOT NULL REFERENCES sites(id),
    column_id TEXT REFERENCES columns(id),
    text TEXT NOT NULL CHECK (length(trim(text)) > 0),
    category TEXT NOT NULL,
    severity TEXT NOT NULL CHECK (severity IN {_in(SEVERITIES)}),
    status TEXT NOT NULL CHECK (status IN {_in(FINDING_STATUSES)})
);
CREATE TABLE photos ({_BOOK},
    sha256 TEXT NOT NULL UNIQUE,
    path TEXT NOT NULL,
    thumb_path TEXT NOT NULL,
    format TEXT NOT NULL,
    width INTEGER NOT NULL,
    height INTEGER NOT NULL,
    bytes INTEGER NOT NULL,
    original_name TEXT,
    exif_taken_at TEXT,
    latitude REAL,
    longitude REAL
);
CREATE TABLE photo_links ({_BOOK},
    photo_id TEXT NOT NULL REFERENCES photos(id),
    finding_id TEXT REFERENCES findings(id),
    column_id TEXT REFERENCES columns(id),
    restraint_change_id TEXT REFERENCES restraint_changes(id),
    caption TEXT,
    CHECK ((finding_id IS NOT NULL) + (column_id IS NOT NULL)
           + (restraint_change_id IS NOT NULL) = 1)
);
CREATE TABLE checks ({_BOOK},
    column_id TEXT NOT NULL REFERENCES columns(id),
    checked_at TEXT NOT NULL,
    record TEXT NOT NULL CHECK (json_valid(record)),
    code TEXT NOT NULL,
    edition TEXT,
    app_version TEXT NOT NULL,
    utilization REAL,
    governing_mode TEXT,
    result TEXT NOT NULL CHECK (json_valid(result)),
    note TEXT
);
CREATE TABLE retrofits ({_BOOK},
    column_id TEXT NOT NULL REFERENCES columns(id),
    description TEXT NOT NULL CHECK (length(trim(description)) > 0),
    record TEXT NOT NULL CHECK (json_valid(record)),
    status TEXT NOT NULL CHECK (status IN {_in(RETROFIT_STATUSES)})
);
"""

#: version 2 adds the indexes that keep listing and history fast on a large site
V2_SQL = """
CREATE INDEX columns_site_tag ON columns(site_id, tag);
CREATE INDEX measurements_column ON measurements(column_id, quantity, taken_at);
CREATE INDEX checks_column ON checks(column_id, checked_at);
CREATE INDEX findings_site ON findings(site_id, status);
CREATE INDEX photo_links_targets ON photo_links(finding_id, column_id, restraint_change_id);
CREATE INDEX visits_site ON visits(site_id, date);
CREATE INDEX restraint_changes_column ON restraint_changes(column_id, date);
CREATE INDEX retrofits_column ON retrofits(column_id);
"""

#: version 4 (m004_people): who made each row (``created_by``, the person set on the device),
#: a site's design basis (LRFD / ASD), EN gamma_M1 and default material for new columns, and
#: a visit's weather and access notes and when it ended
BASES = ("lrfd", "asd")
V4_SQL = "".join(f"ALTER TABLE {t} ADD COLUMN created_by TEXT;\n" for t in DATA_TABLES) + f"""
ALTER TABLE sites ADD COLUMN basis TEXT CHECK (basis IS NULL OR basis IN {_in(BASES)});
ALTER TABLE sites ADD COLUMN gamma_m1 REAL CHECK (gamma_m1 IS NULL OR gamma_m1 BETWEEN 1.0 AND 1.5);
ALTER TABLE sites ADD COLUMN material TEXT;
ALTER TABLE visits ADD COLUMN weather TEXT;
ALTER TABLE visits ADD COLUMN access TEXT;
ALTER TABLE visits ADD COLUMN ended_at TEXT;
"""

#: version 5 (m005_field_notes): where on the column a finding is (face, height as typed), the
#: markup drawn over a photo (JSON shapes; the file stays untouched) and a retrofit option kept
#: as its definition, to be applied to the column as it stands (NULL: an older snapshot row)
V5_SQL = f"""
ALTER TABLE findings ADD COLUMN face TEXT CHECK (face IS NULL OR face IN {_in(FACES)});
ALTER TABLE findings ADD COLUMN height TEXT;
ALTER TABLE photos ADD COLUMN markup TEXT CHECK (markup IS NULL OR json_valid(markup));
ALTER TABLE retrofits ADD COLUMN option TEXT CHECK (option IS NULL OR json_valid(option));
"""

#: version 7 (m007_visits): what is recorded during a visit belongs to it: findings, restraint
#: changes and photo links carry the visit's id as readings already did (NULL: not on a visit)
VISIT_TABLES = ("measurements", "findings", "restraint_changes", "photo_links")
V6_SQL = """
ALTER TABLE findings ADD COLUMN visit_id TEXT REFERENCES visits(id);
ALTER TABLE restraint_changes ADD COLUMN visit_id TEXT REFERENCES visits(id);
ALTER TABLE photo_links ADD COLUMN visit_id TEXT REFERENCES visits(id);
CREATE INDEX measurements_visit ON measurements(visit_id);
CREATE INDEX findings_visit ON findings(visit_id);
CREATE INDEX restraint_changes_visit ON restraint_changes(visit_id);
CREATE INDEX photo_links_visit ON photo_links(visit_id);
"""
