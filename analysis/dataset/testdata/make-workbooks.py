#!/usr/bin/python3
"""Writes the workbooks the dataset tests read, with writers other than bivar's
reader (invented data). Run from this folder:  /usr/bin/python3 make-workbooks.py

  openpyxl-line7.xlsx  openpyxl (Debian python3-openpyxl 3.0.9): two sheets, a
                       title above a header row, merged header cells, dates,
                       error cells, a formula openpyxl cannot calculate, a styled
                       empty row after the data.
  openpyxl-line7.csv   the values openpyxl was given, as a CSV file (dates as
                       Excel serial days, computed here by Python; error cells
                       and the uncalculated formula written NA): what the
                       workbook must read as.
  handmade-cached.xlsx SpreadsheetML written by hand with Python's zipfile: a
                       formula with the value cached beside it, cells of error
                       type (t="e"), inline strings, numbers.
"""
import csv
import datetime
import zipfile

import openpyxl
from openpyxl.styles import Font

EPOCH = datetime.datetime(1899, 12, 30)


def serial(dt):
    return (dt - EPOCH).total_seconds() / 86400


wb = openpyxl.Workbook()
notes = wb.active
notes.title = "Notes"
notes["A1"] = "Invented data for bivar's tests."
ws = wb.create_sheet("October")
# Row 1: a title over B..E; A1:A2 merged vertically holds "lot".
ws["A1"] = "lot"
ws.merge_cells("A1:A2")
ws["B1"] = "Line 7 castings, October (invented)"
ws.merge_cells("B1:E1")
ws["B2"] = "poured"
ws["C2"] = "melt_temp"
ws["D2"] = "hardness"  # over two repeat readings: D2:E2
ws.merge_cells("D2:E2")
rows = [
    ("L01", datetime.datetime(2026, 10, 1, 8, 0), 1412.5, 251.0, 249.5),
    ("L02", datetime.datetime(2026, 10, 1, 14, 30), 1408.25, 247.5, 248.0),
    ("L03", datetime.datetime(2026, 10, 2, 6, 15), "#DIV/0!", 252.0, 250.5),
    ("L04", datetime.datetime(2026, 10, 2, 22, 45), 1415.0, "#N/A", 253.0),
    ("L05", datetime.datetime(2026, 10, 3, 9, 0), 1399.75, 243.0, 244.25),
    ("L06", datetime.datetime(2026, 10, 4, 11, 20), 1421.125, 256.5, "=D8+1"),
    ("L07", datetime.datetime(2026, 10, 5, 7, 5), 1404.0, 246.0, 245.5),
    ("L08", datetime.datetime(2026, 10, 6, 16, 40), 1.5e3, 262.0, 261.0),
    ("L09", datetime.datetime(2026, 10, 7, 3, 10), 1410.0, "#N/A", 249.0),
    ("L10", datetime.datetime(2026, 10, 8, 12, 0), -0.001, 250.0, 251.0),
]
for i, r in enumerate(rows, start=3):
    for j, v in enumerate(r, start=1):
        ws.cell(row=i, column=j, value=v)
# A styled, empty cell two rows below the data: a row element, no value.
ws.cell(row=len(rows) + 5, column=3).font = Font(bold=True)
wb.save("openpyxl-line7.xlsx")

with open("openpyxl-line7.csv", "w", newline="") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(["lot", "poured", "melt_temp", "hardness", "hardness (2)"])
    for r in rows:
        out = [r[0], repr(serial(r[1]))]
        for v in r[2:]:
            out.append("NA" if isinstance(v, str) else repr(float(v)))
        w.writerow(out)

CT = """<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">
<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>
<Default Extension="xml" ContentType="application/xml"/>
<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>
<Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>
</Types>"""
RELS = """<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">
<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/>
</Relationships>"""
WB = """<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">
<sheets><sheet name="Data" sheetId="1" r:id="rId1"/></sheets>
</workbook>"""
WBRELS = """<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">
<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/>
</Relationships>"""


def istr(ref, s):
    return f'<c r="{ref}" t="inlineStr"><is><t>{s}</t></is></c>'


def num(ref, v):
    return f'<c r="{ref}"><v>{v}</v></c>'


def err(ref, e):
    return f'<c r="{ref}" t="e"><v>{e}</v></c>'


def formula(ref, f, cached):
    return f'<c r="{ref}"><f>{f}</f><v>{cached}</v></c>'


sheet_rows = [
    [istr("A1", "x"), istr("B1", "y"), istr("C1", "ratio")],
    [num("A2", "1"), num("B2", "2.5"), formula("C2", "B2/A2", "2.5")],
    [num("A3", "2"), num("B3", "4.75"), formula("C3", "B3/A3", "2.375")],
    [num("A4", "0"), num("B4", "1"), err("C4", "#DIV/0!")],
    [num("A5", "3"), err("B5", "#VALUE!"), err("C5", "#VALUE!")],
    [num("A6", "4"), num("B6", "8.25"), formula("C6", "B6/A6", "2.0625")],
]
SHEET = ('<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
         '<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>'
         + "".join(f'<row r="{i}">' + "".join(r) + "</row>" for i, r in enumerate(sheet_rows, start=1))
         + "</sheetData></worksheet>")
with zipfile.ZipFile("handmade-cached.xlsx", "w", zipfile.ZIP_DEFLATED) as z:
    for name, body in [("[Content_Types].xml", CT), ("_rels/.rels", RELS), ("xl/workbook.xml", WB),
                       ("xl/_rels/workbook.xml.rels", WBRELS), ("xl/worksheets/sheet1.xml", SHEET)]:
        zi = zipfile.ZipInfo(name, date_time=(2026, 12, 5, 0, 0, 0))
        zi.compress_type = zipfile.ZIP_DEFLATED
        z.writestr(zi, body)
