"""The archival form of the report: PDF/A-3b, with the files it was made from attached.

ReportLab lays the report out; this step adds what an archival submittal portal asks of the
file (ISO 19005-3, PDF/A-3, conformance level B):

- XMP metadata that repeats the document information (title, author, subject, dates,
  producer) and declares the part and conformance (``pdfaid``);
- an output intent with an sRGB colour profile (``srgb.icc``: the sRGB profile built into
  Little CMS, written once by Pillow's ``ImageCms.createProfile("sRGB")``; it carries the
  notice "No copyright, use freely");
- the print flag on every annotation (ISO 19005-3, 6.3.2), and no empty page transitions;
- each TrueType font's widths as its embedded program has them (ISO 19005-3, 6.2.11.5):
  ReportLab lists a width for every code of a subset, and for a code the subset does not
  use (a matplotlib math face holds no ASCII) it writes a default the program lacks;
- the attached files (the input, the trace, the step listing) as associated files of the
  document (``/AF``, ISO 19005-3 annex E), each with its MIME type, its relationship to the
  report and its SHA-256 in its description, so that ``calcreport recheck REPORT.pdf`` can
  confirm the trace it finds is the one the report was made from.

The bytes are deterministic: the same report and files give the same PDF (a fixed document
id from the content, dates from the project's date or none).

pikepdf (a binding of qpdf) edits the PDF objects: a well-kept library for what would
otherwise be hand-written PDF object surgery. It is imported on first use.
"""

from __future__ import annotations

import hashlib
import io
import re
from dataclasses import dataclass
from pathlib import Path
from typing import Any
from xml.sax.saxutils import escape

__all__ = ["Attachment", "archival", "attached", "description_sha256"]

_PROFILE = Path(__file__).with_name("srgb.icc")
_PRODUCER = "calcreport"
_PRINT = 4  # annotation flag: print (ISO 32000-1, Table 165)
_SHA = re.compile(r"SHA-256 ([0-9a-f]{64})")


@dataclass(frozen=True)
class Attachment:
    """A file carried inside the report: its name, bytes, MIME type, what it is to the
    report (``Source`` the input, ``Data`` the trace and listing) and a description."""

    name: str
    data: bytes
    mime: str
    relationship: str
    description: str

    @property
    def sha256(self) -> str:
        return hashlib.sha256(self.data).hexdigest()


def description_sha256(description: str) -> str | None:
    """The SHA-256 an attachment's description states, or None."""
    found = _SHA.search(description)
    return found.group(1) if found else None


def _xmp(title: str, author: str, subject: str, date: str | None) -> bytes:
    dates = (
        f"<xmp:CreateDate>{date}</xmp:CreateDate><xmp:ModifyDate>{date}</xmp:ModifyDate>"
        f"<xmp:MetadataDate>{date}</xmp:MetadataDate>"
        if date
        else ""
    )
    text = (
        '<?xpacket begin="\ufeff" id="W5M0MpCehiHzreSzNTczkc9d"?>\n'
        '<x:xmpmeta xmlns:x="adobe:ns:meta/">\n'
        '<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">\n'
        '<rdf:Description rdf:about=""'
        ' xmlns:pdfaid="http://www.aiim.org/pdfa/ns/id/"'
        ' xmlns:dc="http://purl.org/dc/elements/1.1/"'
        ' xmlns:xmp="http://ns.adobe.com/xap/1.0/"'
        ' xmlns:pdf="http://ns.adobe.com/pdf/1.3/">\n'
        "<pdfaid:part>3</pdfaid:part><pdfaid:conformance>B</pdfaid:conformance>\n"
        "<dc:format>application/pdf</dc:format>\n"
        f'<dc:title><rdf:Alt><rdf:li xml:lang="x-default">{escape(title)}</rdf:li>'
        "</rdf:Alt></dc:title>\n"
        f"<dc:creator><rdf:Seq><rdf:li>{escape(author)}</rdf:li></rdf:Seq></dc:creator>\n"
        f'<dc:description><rdf:Alt><rdf:li xml:lang="x-default">{escape(subject)}'
        "</rdf:li></rdf:Alt></dc:description>\n"
        f"<xmp:CreatorTool>{_PRODUCER}</xmp:CreatorTool>{dates}\n"
        f"<pdf:Producer>{_PRODUCER}</pdf:Producer>\n"
        "</rdf:Description>\n</rdf:RDF>\n</x:xmpmeta>\n"
        '<?xpacket end="w"?>'
    )
    return text.encode("utf-8")


def _iso_date(project_date: str) -> tuple[str, str] | None:
    """The project's date as XMP and PDF dates, or None when it is not YYYY-MM-DD."""
    found = re.fullmatch(r"(\d{4})-(\d{2})-(\d{2})", project_date.strip())
    if not found:
        return None
    y, m, d = found.groups()
    return f"{y}-{m}-{d}T00:00:00Z", f"D:{y}{m}{d}000000Z"


def _agree_widths(doc: Any, font: Any) -> None:
    """Make an embedded TrueType subset's widths one story: a code the subset maps to no
    glyph takes the width of the program's .notdef (as a reader draws it); a glyph whose
    advance in the program differs from the width the text was set with takes that width
    (ReportLab writes the advances of a monospaced face's subset in the wrong scale)."""
    from fontTools.ttLib import TTFont

    stream = font.FontDescriptor.FontFile2
    program = TTFont(io.BytesIO(stream.read_bytes()), recalcTimestamp=False)
    table = next((t.cmap for t in program["cmap"].tables if t.platformID == 1), None)
    if table is None:
        table = program.getBestCmap() or {}
    units = program["head"].unitsPerEm
    metrics = program["hmtx"].metrics
    notdef = round(metrics[program.getGlyphOrder()[0]][0] * 1000.0 / units, 3)
    widths = [float(w) for w in font.Widths]
    first = int(font.FirstChar)
    rescaled = False
    for i, width in enumerate(widths):
        glyph = table.get(first + i)
        if glyph is None:
            widths[i] = notdef
        elif abs(metrics[glyph][0] * 1000.0 / units - width) > 0.5:
            metrics[glyph] = (round(width * units / 1000.0), metrics[glyph][1])
            rescaled = True
    font.Widths = [round(w, 3) for w in widths]
    if rescaled:
        data = io.BytesIO()
        program.save(data)
        font.FontDescriptor.FontFile2 = doc.make_stream(
            data.getvalue(), Length1=len(data.getvalue())
        )


def archival(
    pdf: bytes,
    *,
    title: str,
    author: str,
    subject: str,
    project_date: str,
    attachments: tuple[Attachment, ...] = (),
) -> bytes:
    """The report ``pdf`` as PDF/A-3b with ``attachments`` as its associated files."""
    import pikepdf

    dates = _iso_date(project_date)
    with pikepdf.open(io.BytesIO(pdf)) as doc:
        info = pikepdf.Dictionary(
            Title=pikepdf.String(title),
            Author=pikepdf.String(author),
            Subject=pikepdf.String(subject),
            Creator=pikepdf.String(_PRODUCER),
            Producer=pikepdf.String(_PRODUCER),
        )
        if dates:
            info.CreationDate = info.ModDate = pikepdf.String(dates[1])
        doc.trailer.Info = doc.make_indirect(info)
        metadata = doc.make_stream(
            _xmp(title, author, subject, dates[0] if dates else None),
            Type=pikepdf.Name.Metadata,
            Subtype=pikepdf.Name.XML,
        )
        doc.Root.Metadata = metadata
        profile = doc.make_stream(_PROFILE.read_bytes(), N=3)
        doc.Root.OutputIntents = pikepdf.Array(
            [
                pikepdf.Dictionary(
                    Type=pikepdf.Name.OutputIntent,
                    S=pikepdf.Name.GTS_PDFA1,
                    OutputConditionIdentifier=pikepdf.String("sRGB"),
                    Info=pikepdf.String("sRGB IEC61966-2.1"),
                    DestOutputProfile=profile,
                )
            ]
        )
        for font in doc.objects:
            if (
                isinstance(font, pikepdf.Dictionary)
                and font.get("/Subtype") == "/TrueType"
                and "/FontFile2" in font.get("/FontDescriptor", {})
            ):
                _agree_widths(doc, font)
        for page in doc.pages:
            # ReportLab writes an empty page transition; a print archive has no use for it.
            if "/Trans" in page.obj and not page.obj.Trans.keys():
                del page.obj.Trans
            for annotation in page.obj.get("/Annots", []):
                annotation.F = _PRINT
        specs = []
        for item in attachments:
            spec = pikepdf.AttachedFileSpec(
                doc,
                item.data,
                description=f"{item.description} (SHA-256 {item.sha256})",
                filename=item.name,
                mime_type=item.mime,
            )
            spec.obj.AFRelationship = pikepdf.Name("/" + item.relationship)
            doc.attachments[item.name] = spec
            specs.append(spec.obj)
        if specs:
            doc.Root.AF = pikepdf.Array(specs)
        out = io.BytesIO()
        doc.save(
            out,
            min_version="1.7",
            deterministic_id=True,
            fix_metadata_version=False,
            object_stream_mode=pikepdf.ObjectStreamMode.disable,
        )
    return out.getvalue()


def attached(pdf: bytes) -> dict[str, tuple[bytes, str]]:
    """The files attached to a report: name -> (bytes, description)."""
    import pikepdf

    with pikepdf.open(io.BytesIO(pdf)) as doc:
        return {
            name: (spec.get_file().read_bytes(), str(spec.description))
            for name, spec in doc.attachments.items()
        }
