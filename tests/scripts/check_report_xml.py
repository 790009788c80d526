#!/usr/bin/python3
"""The report and every figure parse with Python's standard parsers
(xml.etree for SVG, html.parser for the HTML page), and every option and
crossover named in the JSON of `tournament --json` and `sweep --json` appears
in the figure's text.

Usage: check_report_xml.py BINARY SOURCE_DIR
"""
import html.parser
import json
import os
import re
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

SVG = "{http://www.w3.org/2000/svg}"
# Elements of HTML that have no end tag (the HTML standard's list of void elements).
VOID = {"area", "base", "br", "col", "embed", "hr", "img", "input", "link", "meta", "source", "track", "wbr"}

failures = []


def check(cond, what):
    if not cond:
        failures.append(what)
        print("FAIL:", what)


def run(binary, *args, expect=0):
    p = subprocess.run([binary, *args], capture_output=True, text=True, timeout=240)
    if p.returncode != expect:
        raise SystemExit(f"{' '.join(args)}: exit {p.returncode} (wanted {expect})\n{p.stderr}")
    return p


def svg_texts(root):
    return ["".join(t.itertext()) for t in root.iter(SVG + "text")]


def parse_svg_file(path):
    with open(path, encoding="utf-8") as f:
        data = f.read()
    check(data.startswith("<?xml"), f"{path}: starts with the XML declaration")
    root = ET.fromstring(data)  # raises on malformed XML
    check(root.tag == SVG + "svg", f"{path}: the root is an svg element")
    return root, data


class Page(html.parser.HTMLParser):
    """Tracks open elements: every non-void element must be closed in order."""

    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.stack, self.errors, self.title, self.tags = [], [], "", {}
        self.external = []
        self._in_title = False

    def handle_starttag(self, tag, attrs):
        self.tags[tag] = self.tags.get(tag, 0) + 1
        for k, v in attrs:
            if k in ("src", "href") and v and not v.startswith("#"):
                self.external.append(v)
        if tag not in VOID:
            self.stack.append(tag)
        self._in_title = tag == "title" and self.stack[:2] == ["html", "head"]

    def handle_startendtag(self, tag, attrs):
        self.tags[tag] = self.tags.get(tag, 0) + 1  # <circle .../> inside inline SVG

    def handle_endtag(self, tag):
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"</{tag}> closes {self.stack[-1] if self.stack else 'nothing'}")
            return
        self.stack.pop()
        self._in_title = False

    def handle_data(self, data):
        if self._in_title:
            self.title += data


def main():
    binary, source = sys.argv[1], sys.argv[2]
    scenario = os.path.join(source, "data", "long-road.toml")
    with tempfile.TemporaryDirectory() as tmp:
        # 1. Digraph against tournament --json (600 squares: a cycle of the three options).
        tj = json.loads(run(binary, "tournament", "--scenario", scenario, "--json").stdout)
        dig = os.path.join(tmp, "digraph.svg")
        run(binary, "report", "--scenario", scenario, "--figure", "digraph", "-o", dig)
        root, _ = parse_svg_file(dig)
        texts = svg_texts(root)
        for name in tj["options"]:
            check(name in texts, f"digraph names option {name!r}")
        check(len(tj["cycles"]) > 0, "the scenario has a cycle (so the highlight is exercised)")
        legend = " ".join(texts)
        for c in tj["cycles"][:1]:
            # The strongest cycle is spelled out in the legend, each option in order.
            check(" \u2192 ".join(c["options"] + c["options"][:1]) in legend.replace("\u2192  ", "\u2192 "),
                  f"digraph legend spells the strongest cycle {c['options']}")
        check(len(list(root.iter(SVG + "polygon"))) == len(tj["arcs"]) + 3, "one arrowhead per arc (+3 in the legend)")

        # 2. Sweep figure against sweep --json.
        lengths = "20..140"
        sj = json.loads(run(binary, "sweep", "--scenario", scenario, "--lengths", lengths, "--json").stdout)
        sw = os.path.join(tmp, "sweep.svg")
        run(binary, "report", "--scenario", scenario, "--lengths", lengths, "--figure", "sweep", "-o", sw)
        root, _ = parse_svg_file(sw)
        texts = svg_texts(root)
        joined = "\n".join(texts)
        check(0 < len(sj["crossovers"]) <= 30, f"the range has 1..30 crossovers (has {len(sj['crossovers'])})")
        for c in sj["crossovers"]:
            where = f"at {c['length']}" if c["length"] is not None else f"in {c['interval'][0]}..{c['interval'][1]}"
            want = f"crossover {where}: {c['a']} vs {c['b']}:"
            check(any(want in t for t in texts), f"sweep figure names {want!r}")
        for name in tj["options"]:  # the same scenario, so the same options
            check(name in joined, f"sweep figure names option {name!r}")
        for c in sj["cycles"]:
            check(any(t.startswith("cycle " + c["options"][0]) for t in texts), f"sweep figure lists cycle {c['options']}")

        # 3. Distribution figure.
        dist = os.path.join(tmp, "distribution.svg")
        run(binary, "report", "--scenario", scenario, "--figure", "distribution", "-o", dist)
        root, _ = parse_svg_file(dist)
        texts = svg_texts(root)
        for name in tj["options"]:
            check(name in texts, f"distribution figure names option {name!r}")
        check("P(never finishing)" in texts, "distribution figure shows the chance of never finishing")

        # 4. Same input, same bytes.
        dig2 = os.path.join(tmp, "digraph2.svg")
        run(binary, "report", "--scenario", scenario, "--figure", "digraph", "-o", dig2)
        check(open(dig, "rb").read() == open(dig2, "rb").read(), "digraph SVG is byte-identical on a second run")

        # 5. The HTML report, with the several-piece sections asked for on a short board.
        page = os.path.join(tmp, "report.html")
        run(binary, "report", "1d6", "2d6", "3d6", "--length", "40", "--lengths", "20..60", "--race",
            "--choose", "2", "--balance-starts", "0..3", "--balance-lengths", "30..50",
            "--policy-against", "2d6", "--policy-distance", "20", "-o", page)
        with open(page, encoding="utf-8") as f:
            doc = f.read()
        p = Page()
        p.feed(doc)
        p.close()
        check(not p.errors, f"HTML elements nest properly: {p.errors[:3]}")
        check(not p.stack, f"HTML: every element closed (open: {p.stack})")
        check(p.title == "overshoot report: 1d6, 2d6, 3d6 on 40 squares", f"HTML title {p.title!r}")
        check(p.tags.get("script", 0) == 0, "no script")
        check(not p.external, f"nothing fetched: {p.external[:3]}")
        check(p.tags.get("style", 0) == 1 and p.tags.get("link", 0) == 0, "CSS inline, no stylesheet link")
        svgs = re.findall(r"<svg .*?</svg>", doc, flags=re.S)
        check(len(svgs) == 4, f"four inline figures (found {len(svgs)})")
        for s in svgs:
            ET.fromstring(s)  # every inline figure is well-formed XML on its own
        for sec in ("rules", "profiles", "matrix", "digraph", "cycles", "counters", "equilibrium", "sweep",
                    "race", "choice", "balance", "policy"):
            check(f'<section id="{sec}">' in doc, f"report has the {sec} section")
        # 6. The board search section: the same boards as `search --json`, the best drawn.
        page3 = os.path.join(tmp, "report-search.html")
        args = ["1d6", "2d6", "3d6", "--length", "40"]
        run(binary, "report", *args, "--search-target", "cycle", "--search-cycle", "1d6 > 3d6 > 2d6 > 1d6",
            "--search-head-starts", "2", "-o", page3)
        sj = json.loads(run(binary, "search", *args, "--cycle", "1d6 > 3d6 > 2d6 > 1d6", "--head-starts", "2",
                            "--json").stdout)
        with open(page3, encoding="utf-8") as f:
            doc3 = f.read()
        p3 = Page()
        p3.feed(doc3)
        p3.close()
        check(not p3.errors and not p3.stack, f"search report: HTML elements nest and close: {p3.errors[:3]} {p3.stack}")
        check('<section id="search">' in doc3, "report has the search section")
        svgs3 = re.findall(r"<svg .*?</svg>", doc3, flags=re.S)
        for s3 in svgs3:
            ET.fromstring(s3)
        check(any("Best board of the search" in s3 for s3 in svgs3), "the best board is drawn")
        section = doc3[doc3.index('<section id="search">'):]
        for b in sj["best"]:
            flags = b["flags"].replace("'", "&#39;")
            check(flags in section or b["flags"] in section, f"search report lists the board {b['flags']}")
        check(section.count("<tr>") == len(sj["best"]) + 1, "one row per board listed, and the header")
        # Policy section against policy --json, and its map as a stand-alone figure.
        pj = json.loads(run(binary, "policy", "--length", "40", "--menu", "1d6,2d6,3d6", "--against", "2d6",
                            "--json").stdout)
        check(f"<td>adaptive</td><td>{100 * pj['p_a_wins']:.4f}%</td>" in doc, "policy section shows P(A wins)")
        pol = os.path.join(tmp, "policy.svg")
        run(binary, "policy", "--length", "40", "--menu", "1d6,2d6,3d6", "--against", "2d6", "--format", "svg", "-o", pol)
        texts = svg_texts(parse_svg_file(pol)[0])
        for name in ("1d6", "2d6", "3d6"):
            check(name in texts, f"policy figure's legend names {name}")
        # Race section against race --json (same board, same order).
        rj = json.loads(run(binary, "race", "1d6", "2d6", "3d6", "--length", "40", "--json").stdout)
        for name, pw in rj["p_wins"].items():
            check(f"<td>{name}</td><td>{100 * pw:.4f}%</td>" in doc, f"race section shows {name} at {pw}")

        # 6. Without the flags the several-piece sections are absent.
        page2 = os.path.join(tmp, "plain.html")
        run(binary, "report", "1d6", "2d6", "--length", "30", "-o", page2)
        plain = open(page2, encoding="utf-8").read()
        for sec in ("sweep", "race", "choice", "balance", "policy"):
            check(f'<section id="{sec}">' not in plain, f"plain report has no {sec} section")

        # 7. Bad input: one line, exit 2, no file written.
        bad = os.path.join(tmp, "bad.html")
        p = run(binary, "report", "1d6", "2x6", "--length", "30", "-o", bad, expect=2)
        check(len(p.stderr.strip().splitlines()) == 1, f"one error line: {p.stderr!r}")
        check(not os.path.exists(bad), "no partial report on bad input")
        p = run(binary, "report", "1d6", "--length", "30", "--figure", "pie", "-o", bad, expect=2)
        check("pie" in p.stderr and not os.path.exists(bad), "unknown figure refused, nothing written")
    if failures:
        print(f"{len(failures)} check(s) failed")
        return 1
    print("report and figures: all checks passed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
