"""Reference fixture for the preview's CSV reader (taskpane/csv.ts).

Python's own csv module (csv.reader, the default "excel" dialect with the given delimiter, text
opened with newline="" as its documentation asks) splits each text into records; csv.Sniffer
guesses the delimiter of the texts without title lines. Texts cover the separators the preview
reads (comma, semicolon, tab), decimal commas, quoted fields with separators, doubled quotes and
line breaks inside, a byte-order mark (removed before reading, as the preview does), blank lines
and CRLF / LF / CR line ends. Writes:

  fixtures/csv_files.json   for each case: text, delimiter, records (csv.reader), sniffed
                            (csv.Sniffer().sniff(text, delimiters=",;\\t").delimiter, or null
                            when the case is not meant for the sniffer)

Command: /usr/bin/python3 test/reference/gen_csv_files.py   (working directory: the repository
root; run by test/reference/generate.sh). Deterministic output.
"""

import csv
import io
import json
import platform

CASES = [
    # name, text, delimiter, sniff?
    ("semicolons and decimal commas", "Stunden;Verschleiß (µm)\r\n0;25,3\r\n10;27,9\r\n20;31,0\r\n", ";", True),
    ("commas and decimal points", "temp,strength\n880,20.5\n900,22.25\n950,23\n", ",", True),
    ("tabs and decimal commas", "Zeit\tSignal\n1\t0,5\n2\t-1,25e1\n3\t4\n", "\t", True),
    ("quoted separators and doubled quotes", 'Probe;"Wert; ""mg/l"""\n"A 1";"12,5"\nB;13\n', ";", True),
    ("quoted decimal commas in a comma file", 'h,w\n0,"25,3"\n10,"27,9"\n20,"30,1"\n', ",", True),
    ("a line break inside quotes", 'id,"note"\n1,"first\nsecond"\n2,plain\n', ",", False),
    ("blank lines inside", "x;y\n1;2\n\n3;4\n", ";", False),
    ("lone CR line ends", "x,y\r1,2\r3,4\r", ",", False),
    ("empty fields", "a;b;c\n1;;3\n;;\n", ";", False),
    ("no final line break", "x\ty\n1\t2", "\t", False),
    ("title line above a semicolon table", "Verschleißprüfung, Prüfstand 3\n\nStunden;Verschleiß\n0;25,3\n10;27,9\n", ";", False),
]


def records(text, delimiter):
    return [row for row in csv.reader(io.StringIO(text, newline=""), delimiter=delimiter)]


def main():
    out = []
    for name, text, delimiter, sniff in CASES:
        sniffed = csv.Sniffer().sniff(text, delimiters=",;\t").delimiter if sniff else None
        out.append({"name": name, "text": text, "delimiter": delimiter, "records": records(text, delimiter), "sniffed": sniffed})
    doc = {
        "source": "Python csv module: csv.reader (dialect 'excel', given delimiter, newline='') and csv.Sniffer().sniff(delimiters=',;\\t')",
        "versions": {"python": platform.python_version()},
        "command": "/usr/bin/python3 test/reference/gen_csv_files.py",
        "cases": out,
    }
    with open("test/reference/fixtures/csv_files.json", "w", encoding="utf-8") as f:
        json.dump(doc, f, ensure_ascii=False, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
