"""Write each board's JSON report to a folder, the tool version left out, for comparing two
versions of ledlint byte for byte (a reshaping must not change a single finding or figure).

Run: python tests/snapshot.py OUT_DIR     then: diff -r BEFORE_DIR AFTER_DIR
Boards: the sample boards, the test fixtures and the real corpus (../shared/corpus/real).
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

from paths import CORPUS, FIXTURES, SAMPLES

from ledlint.report import json_doc
from ledlint.review.run import check


def main(out: Path) -> None:
    out.mkdir(parents=True, exist_ok=True)
    boards = sorted(SAMPLES.glob("*.net")) + sorted(FIXTURES.glob("*.net")) + sorted(CORPUS.glob("*.net"))
    for board in boards:
        doc = json_doc.document(check([board]))
        doc["tool"].pop("version", None)
        (out / (board.stem + ".json")).write_text(json.dumps(doc, indent=1, ensure_ascii=False) + "\n",
                                                  encoding="utf-8")
    print(f"{len(boards)} boards written to {out}")


if __name__ == "__main__":
    main(Path(sys.argv[1]))
