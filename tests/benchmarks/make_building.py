"""Synthetic but plausible timber buildings for the scale benchmark, with claims files.

    python -m tests.benchmarks.make_building --bearings 10000 --out /tmp/b10k

A building is storeys of a post grid: each storey's posts stand on the beams of the storey
below (the ground storey on continuous sill plates), glulam beams run along the grid lines
continuously over the posts, and sawn joists span between beams. Posts land on beams right
over the posts below and some joists land within d of a post, so near-support checks appear.
The claims file takes the recomputed checks and leaves out or mis-states a controlled share.
Invented data only.
"""

from __future__ import annotations

import argparse
import random
import sys
from pathlib import Path

import yaml

SPACING = 4.8  # m between posts along a beam
BAY = 4.2  # m between beam lines (joist span)
JOISTS_PER_SEGMENT = 8
END = 0.15  # m from beam end to the first post


def bearing_count(storeys: int, n: int) -> int:
    return storeys * (2 * n * n + 2 * JOISTS_PER_SEGMENT * (n - 1) ** 2)


def grid_for(bearings: int) -> tuple[int, int, int]:
    """(storeys, beam lines, posts per line) giving about ``bearings`` bearings."""
    per_joist_bay = 2 + 2 * JOISTS_PER_SEGMENT
    storeys = min(6, max(2, round((bearings / per_joist_bay) ** (1 / 3) / 1.5)))
    n = min(range(3, 400), key=lambda k: abs(bearing_count(storeys, k) - bearings))
    return storeys, n, n


def building(bearings: int) -> dict:
    storeys, nx, ny = grid_for(bearings)
    beam_length = END * 2 + SPACING * (ny - 1)
    members = []
    out_bearings = []
    loads = []
    materials = {
        "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
        "GLS": {"family": "glulam", "species": "D.Fir-L", "grade": "20f-EX"},
        "GLP": {"family": "glulam", "species": "Spruce-Pine", "grade": "12c-E"},
        "DF2": {"family": "sawn_lumber", "species": "D.Fir-L", "grade": "No.2"},
        "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
    }
    for i in range(nx):
        members.append(
            {
                "id": f"S-{i}",
                "material": "DF2",
                "b": "140 mm",
                "d": "38 mm",
                "length": f"{beam_length:.3f} m",
                "support": "continuous",
                "level": "L0",
                "label": "Sill plate (flat)",
            }
        )
    for k in range(storeys):
        level = f"L{k + 1}"
        top = k == storeys - 1
        for i in range(nx):
            beam = f"B{k + 1}-{i}"
            members.append(
                {
                    "id": beam,
                    "material": "GL",
                    "b": "175 mm",
                    "d": "608 mm",
                    "length": f"{beam_length:.3f} m",
                    "level": level,
                }
            )
            for j in range(ny):
                post = f"P{k + 1}-{i}-{j}"
                members.append(
                    {
                        "id": post,
                        "material": "GLP",
                        "b": "265 mm",
                        "d": "266 mm",
                        "length": "3.2 m",
                        "orientation": "vertical",
                        "level": level,
                    }
                )
                y = END + SPACING * j
                below = f"S-{i}" if k == 0 else f"B{k}-{i}"
                out_bearings.append(
                    {
                        "id": f"{post}/{below}",
                        "upper": post,
                        "lower": {"member": below, "at": f"{y:.3f} m"},
                        "aliases": [f"Post {post} base"],
                    }
                )
                out_bearings.append(
                    {
                        "id": f"{beam}/{post}",
                        "upper": {"member": beam, "at": f"{y:.3f} m"},
                        "lower": post,
                        "aliases": [f"Beam {beam} at post {post}"],
                    }
                )
        for i in range(nx - 1):
            for j in range(ny - 1):
                for m in range(JOISTS_PER_SEGMENT):
                    joist = f"J{k + 1}-{i}-{j}-{m}"
                    y = END + SPACING * j + SPACING * (m + 0.35) / JOISTS_PER_SEGMENT
                    members.append(
                        {
                            "id": joist,
                            "material": "SPF",
                            "b": "38 mm",
                            "d": "286 mm",
                            "length": f"{BAY:.2f} m",
                            "level": level,
                        }
                    )
                    for beam_line, at in ((i, 0.0875), (i + 1, BAY - 0.0875)):
                        beam = f"B{k + 1}-{beam_line}"
                        out_bearings.append(
                            {
                                "id": f"{joist}/{beam}",
                                "upper": {"member": joist, "at": f"{at:.4f} m"},
                                "lower": {"member": beam, "at": f"{y:.3f} m"},
                            }
                        )
                    spec = {"D": "0.4 kN/m", "S": "1.0 kN/m"} if top else {"D": "0.5 kN/m", "L": "1.1 kN/m"}
                    loads.append({"member": joist, "type": "uniform", "specified": spec})
    return {
        "project": {
            "title": f"Synthetic building, {storeys} storeys, {nx} x {ny} grid (invented)",
            "calc": "Synthetic calc package (invented)",
            "reviewer": "Benchmark",
            "date": "2026-01-01",
        },
        "materials": materials,
        "members": members,
        "bearings": out_bearings,
        "loads": loads,
    }


def claims_for(model_path: Path, share_missing: float, share_slip: float, seed: int = 7) -> dict:
    """Claims from the recomputed checks: some left out, some with a slip (x1.15 on Qr, x0.7 on Qf)."""
    from audit.review.review import review_model

    review = review_model(model_path)
    rnd = random.Random(seed)
    items = []
    for n, r in enumerate(review.results):
        roll = rnd.random()
        if roll < share_missing:
            continue
        qf, qr = r.governing.qf, r.governing.qr
        if roll < share_missing + share_slip:
            if rnd.random() < 0.5:
                qr *= 1.15
            else:
                qf *= 0.7
        items.append(
            {
                "id": f"c{n}",
                "where": {"page": 10 + n // 40, "item": str(n % 40 + 1)},
                "location": r.check.bearing,
                "member": r.check.member,
                "kind": r.check.kind,
                "Qf": f"{qf / 1000:.3f} kN",
                "Qr": f"{qr / 1000:.3f} kN",
                "adequate": qf <= qr,
            }
        )
    return {"claims": items}


def write(out: Path, bearings: int, share_missing: float = 0.05, share_slip: float = 0.05) -> tuple[Path, Path, int]:
    out.mkdir(parents=True, exist_ok=True)
    data = building(bearings)
    model = out / "model.yaml"
    model.write_text(yaml.dump(data, Dumper=yaml.CSafeDumper, sort_keys=False, width=200))
    claims = out / "claims.yaml"
    claims.write_text(
        yaml.dump(claims_for(model, share_missing, share_slip), Dumper=yaml.CSafeDumper, sort_keys=False, width=200)
    )
    return model, claims, len(data["bearings"])


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--bearings", type=int, default=1000)
    parser.add_argument("--out", type=Path, required=True)
    args = parser.parse_args(argv)
    model, claims, n = write(args.out, args.bearings)
    print(f"wrote {model} and {claims}: {n} bearings")
    return 0


if __name__ == "__main__":
    sys.exit(main())
