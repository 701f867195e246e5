"""The floor: the least work any report on this stack can do.

Start Python, import reportlab, matplotlib (Agg), numpy and pint, draw one
line chart and write a two-page PDF. Every benchmark target is a ratio to
this script's median time, measured in the same run.
"""

import io
import sys

import matplotlib

matplotlib.use("Agg")
import numpy as np
import pint
from matplotlib.figure import Figure
from reportlab.lib.pagesizes import A4
from reportlab.lib.utils import ImageReader
from reportlab.pdfgen import canvas


def main(out: str) -> None:
    pint.UnitRegistry()
    x = np.linspace(0.0, 1.0, 50)
    fig = Figure(figsize=(6, 3.5))
    fig.add_subplot().plot(x, x**2)
    png = io.BytesIO()
    fig.savefig(png, format="png", dpi=100)
    png.seek(0)
    pdf = canvas.Canvas(out, pagesize=A4)
    pdf.drawString(72, 770, "Floor page 1")
    pdf.drawImage(ImageReader(png), 72, 400, 432, 252)
    pdf.showPage()
    pdf.drawString(72, 770, "Floor page 2")
    pdf.showPage()
    pdf.save()


if __name__ == "__main__":
    main(sys.argv[1])
