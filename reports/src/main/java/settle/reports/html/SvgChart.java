package settle.reports.html;

import java.util.List;

/**
 * An inline SVG chart on two numeric axes: frame, grid, ticks and axis titles, then lines, bands and marks
 * in data coordinates. Every text goes through the escaping {@link HtmlWriter}. A value that is not finite, or
 * that lies off an axis, is not drawn (lines break there), so no coordinate leaves the picture.
 */
public final class SvgChart {

    /** Largest |pixel coordinate| written. */
    static final double PIXEL_LIMIT = 100_000;

    private final HtmlWriter w;
    private final double width;
    private final double height;
    private final double left;
    private final double right;
    private final double top;
    private final double bottom;
    private final Axis x;
    private final Axis y;
    private boolean ended;

    /**
     * Starts a chart and draws its frame.
     *
     * @param w where to write
     * @param id the svg element's id (or null)
     * @param cssClass the svg element's class
     * @param width width in px
     * @param height height in px
     * @param left left margin in px (room for tick labels and the y title)
     * @param x the horizontal axis
     * @param y the vertical axis
     * @param description what the chart shows, for screen readers (its {@code <title>})
     */
    public SvgChart(HtmlWriter w, String id, String cssClass, double width, double height, double left, Axis x, Axis y,
            String description) {
        this.w = w;
        this.width = width;
        this.height = height;
        this.left = left;
        this.right = 16;
        this.top = 12;
        this.bottom = 46;
        this.x = x;
        this.y = y;
        w.open("svg", "id", id, "class", cssClass, "viewBox",
                "0 0 " + n(width) + " " + n(height), "width", n(width), "height", n(height), "role", "img");
        w.element("title", description);
        frame();
    }

    /** @return the horizontal pixel of a data value */
    public double px(double v) {
        return left + x.map(v) * (width - left - right);
    }

    /** @return the vertical pixel of a data value */
    public double py(double v) {
        return height - bottom - y.map(v) * (height - top - bottom);
    }

    /** @return the pixel of the plot's top edge */
    public double plotTop() {
        return top;
    }

    /** @return the pixel of the plot's left edge */
    public double plotLeft() {
        return left;
    }

    /** @return the pixel of the plot's right edge */
    public double plotRight() {
        return width - right;
    }

    private void frame() {
        double x0 = left;
        double x1 = width - right;
        double y0 = height - bottom;
        double y1 = top;
        w.open("g", "class", "axes");
        for (double t : y.label() == null ? new double[0] : y.ticks()) {
            double p = py(t);
            w.empty("line", "class", "grid", "x1", n(x0), "x2", n(x1), "y1", n(p), "y2", n(p));
            w.element("text", Axis.format(t), "class", "tick", "x", n(x0 - 5), "y", n(p + 4), "text-anchor", "end");
        }
        for (double t : x.ticks()) {
            double p = px(t);
            w.empty("line", "class", "grid", "x1", n(p), "x2", n(p), "y1", n(y0), "y2", n(y1));
            w.element("text", Axis.format(t), "class", "tick", "x", n(p), "y", n(y0 + 15), "text-anchor", "middle");
        }
        w.empty("rect", "class", "frame", "x", n(x0), "y", n(y1), "width", n(x1 - x0), "height", n(y0 - y1));
        w.element("text", x.label() + (x.isLog() ? " (log scale)" : ""), "class", "axis-title", "x",
                n((x0 + x1) / 2), "y", n(height - 8), "text-anchor", "middle");
        if (y.label() != null) {
            double cy = (y0 + y1) / 2;
            w.element("text", y.label() + (y.isLog() ? " (log scale)" : ""), "class", "axis-title", "x", "12", "y",
                    n(cy), "text-anchor", "middle", "transform", "rotate(-90 12 " + n(cy) + ")");
        }
        w.close("g");
    }

    /**
     * A line through the points whose coordinates are both drawable: NaN, infinite, off-axis and (on a log axis)
     * non-positive values break the line. A point with no drawable neighbour gets a small dot, so it is seen.
     *
     * @return the number of points with finite coordinates that lie off the axes and are not drawn
     */
    public int line(double[] xs, double[] ys, Palette.Style style, String cssClass) {
        StringBuilder d = new StringBuilder(xs.length * 14);
        int off = 0;
        boolean pen = false;
        int run = 0;
        double lastA = Double.NaN;
        double lastB = Double.NaN;
        List<double[]> single = new java.util.ArrayList<>();
        for (int i = 0; i <= xs.length; i++) {
            boolean drawable = false;
            double a = Double.NaN;
            double b = Double.NaN;
            if (i < xs.length) {
                a = px(xs[i]);
                b = py(ys[i]);
                drawable = Double.isFinite(a) && Double.isFinite(b) && x.contains(xs[i]) && y.contains(ys[i]);
                if (!drawable && Double.isFinite(xs[i]) && Double.isFinite(ys[i]) && (!y.isLog() || ys[i] > 0)) {
                    off++;
                }
            }
            if (!drawable) {
                if (run == 1) {
                    single.add(new double[] {lastA, lastB});
                }
                pen = false;
                run = 0;
                continue;
            }
            d.append(pen ? 'L' : 'M').append(n(a)).append(' ').append(n(b)).append(' ');
            pen = true;
            run++;
            lastA = a;
            lastB = b;
        }
        if (d.length() == 0) {
            return off;
        }
        w.empty("path", "class", cssClass, "d", d.toString().trim(), "fill", "none", "stroke", style.colour(),
                "stroke-dasharray", style.dash());
        for (double[] p : single) {
            w.empty("circle", "class", cssClass + " point", "cx", n(p[0]), "cy", n(p[1]), "r", "2.2", "fill",
                    style.colour());
        }
        return off;
    }

    /** A filled band between lo and hi (the IQR of a median line). */
    public void band(double[] xs, double[] lo, double[] hi, Palette.Style style, String cssClass) {
        StringBuilder d = new StringBuilder(xs.length * 28);
        int count = 0;
        for (int i = 0; i < xs.length; i++) {
            double a = px(xs[i]);
            double b = py(hi[i]);
            if (Double.isFinite(a) && Double.isFinite(b)) {
                d.append(count == 0 ? 'M' : 'L').append(n(a)).append(' ').append(n(clampY(b))).append(' ');
                count++;
            }
        }
        for (int i = xs.length - 1; i >= 0; i--) {
            double a = px(xs[i]);
            double b = py(lo[i]);
            if (Double.isFinite(a) && Double.isFinite(b)) {
                d.append('L').append(n(a)).append(' ').append(n(clampY(b))).append(' ');
            }
        }
        if (count < 2) {
            return;
        }
        w.empty("path", "class", cssClass, "d", d.append('Z').toString(), "fill", style.colour(), "stroke", "none");
    }

    /**
     * A vertical marker across the plot at data value vx: a group of class {@code cssClass} holding its
     * {@code <title>}, a dashed line in the style's colour and a small label near the top (row {@code row} of
     * labels, so that markers of several arms at one epoch stay legible). Nothing when vx is off the axis.
     */
    public void vertical(double vx, Palette.Style style, String cssClass, String label, String tooltip, int row) {
        double a = px(vx);
        if (!Double.isFinite(a) || a < left - 0.5 || a > width - right + 0.5) {
            return;
        }
        w.open("g", "class", cssClass);
        w.element("title", tooltip);
        w.empty("line", "x1", n(a), "x2", n(a), "y1", n(top), "y2", n(height - bottom), "stroke", style.colour(),
                "stroke-width", "1.2", "stroke-dasharray", "3 2");
        w.element("text", label, "class", "mark-label", "x", n(a + 3), "y", n(top + 10 + 11 * row), "fill",
                style.colour());
        w.close("g");
    }

    /**
     * A shaded span across the plot's height from data value {@code from} to {@code to} (a range of x), cut to the
     * axis, of class {@code cssClass} (its fill is the style sheet's), with a {@code <title>}. Nothing when it does
     * not meet the axis or an end is not finite.
     */
    public void span(double from, double to, String cssClass, String tooltip) {
        double a = px(from);
        double b = px(to);
        if (!Double.isFinite(a) || !Double.isFinite(b) || b < a) {
            return;
        }
        a = Math.max(left, a);
        b = Math.min(width - right, b);
        if (b < a) {
            return;
        }
        double shown = Math.max(1.5, b - a);
        w.open("rect", "class", cssClass, "x", n(Math.min(a, width - right - shown)), "y", n(top), "width", n(shown),
                "height", n(height - top - bottom));
        w.element("title", tooltip);
        w.close("rect");
    }

    /**
     * A short vertical tick of class {@code cssClass} centred on data point (vx, vy), held inside the plot, with
     * a {@code <title>}. Nothing when vx is off the axis; a vy that cannot be drawn puts it on the bottom edge.
     */
    public void tick(double vx, double vy, Palette.Style style, String cssClass, String tooltip) {
        double a = px(vx);
        if (!Double.isFinite(a) || a < left - 0.5 || a > width - right + 0.5) {
            return;
        }
        double b = py(vy);
        b = Double.isFinite(b) ? Math.max(top + 5, Math.min(height - bottom - 5, b)) : height - bottom - 5;
        w.open("line", "class", cssClass, "x1", n(a), "x2", n(a), "y1", n(b - 5), "y2", n(b + 5), "stroke",
                style.colour(), "stroke-width", "1.6");
        w.element("title", tooltip);
        w.close("line");
    }

    /**
     * Writes the swatch of a legend entry for a series drawn in {@code style}: its marker, on a line of its colour
     * and dash when {@code line}; hidden from screen readers (the entry's text names the series).
     */
    public static void legendSwatch(HtmlWriter w, Palette.Style style, boolean line) {
        w.open("svg", "width", "34", "height", "14", "class", "swatch", "aria-hidden", "true");
        if (line) {
            w.empty("line", "x1", "1", "x2", "33", "y1", "7", "y2", "7", "stroke", style.colour(), "stroke-width", "2",
                    "stroke-dasharray", style.dash());
        }
        marker(w, 17, 7, 4, style.shape(), style.colour(), true, "swatch-mark", null);
        w.close("svg");
    }

    /**
     * A marker at pixel (cx, cy).
     *
     * @param tooltip text of its {@code <title>} (or null)
     */
    public static void marker(HtmlWriter w, double cx, double cy, double r, Palette.Shape shape, String colour,
            boolean filled, String cssClass, String tooltip) {
        String fill = filled ? colour : "#ffffff";
        String tag;
        String[] geometry;
        switch (shape) {
            case CIRCLE -> {
                tag = "circle";
                geometry = new String[] {"cx", n(cx), "cy", n(cy), "r", n(r)};
            }
            case SQUARE -> {
                tag = "rect";
                geometry = new String[] {"x", n(cx - r * 0.85), "y", n(cy - r * 0.85), "width", n(1.7 * r), "height",
                    n(1.7 * r)};
            }
            default -> {
                tag = "path";
                geometry = new String[] {"d", shapePath(shape, cx, cy, r)};
            }
        }
        String[] attrs = new String[geometry.length + 8];
        attrs[0] = "class";
        attrs[1] = cssClass;
        System.arraycopy(geometry, 0, attrs, 2, geometry.length);
        int i = 2 + geometry.length;
        boolean lineOnly = shape == Palette.Shape.PLUS || shape == Palette.Shape.CROSS;
        attrs[i++] = "fill";
        attrs[i++] = lineOnly ? "none" : fill;
        attrs[i++] = "stroke";
        attrs[i++] = colour;
        attrs[i++] = "stroke-width";
        attrs[i] = lineOnly ? "2" : "1.2";
        if (tooltip == null) {
            w.empty(tag, attrs);
        } else {
            w.open(tag, attrs);
            w.element("title", tooltip);
            w.close(tag);
        }
    }

    /** A marker at data coordinates (vx, vy); nothing when not finite or off the axes. */
    public void mark(double vx, double vy, Palette.Style style, boolean filled, String cssClass, String tooltip) {
        double a = px(vx);
        double b = py(vy);
        if (!Double.isFinite(a) || !Double.isFinite(b) || !x.contains(vx) || !y.contains(vy)) {
            return;
        }
        marker(w, a, b, 3.6, style.shape(), style.colour(), filled, cssClass, tooltip);
    }

    private static String shapePath(Palette.Shape shape, double cx, double cy, double r) {
        return switch (shape) {
            case TRIANGLE -> "M" + n(cx) + " " + n(cy - r * 1.15) + "L" + n(cx + r) + " " + n(cy + r * 0.75) + "L"
                    + n(cx - r) + " " + n(cy + r * 0.75) + "Z";
            case TRIANGLE_DOWN -> "M" + n(cx) + " " + n(cy + r * 1.15) + "L" + n(cx + r) + " " + n(cy - r * 0.75)
                    + "L" + n(cx - r) + " " + n(cy - r * 0.75) + "Z";
            case DIAMOND -> "M" + n(cx) + " " + n(cy - r * 1.2) + "L" + n(cx + r) + " " + n(cy) + "L" + n(cx) + " "
                    + n(cy + r * 1.2) + "L" + n(cx - r) + " " + n(cy) + "Z";
            case PLUS -> "M" + n(cx - r) + " " + n(cy) + "H" + n(cx + r) + "M" + n(cx) + " " + n(cy - r) + "V"
                    + n(cy + r);
            default -> "M" + n(cx - r) + " " + n(cy - r) + "L" + n(cx + r) + " " + n(cy + r) + "M" + n(cx - r) + " "
                    + n(cy + r) + "L" + n(cx + r) + " " + n(cy - r);
        };
    }

    private double clampY(double b) {
        return Math.max(top - 2, Math.min(height - bottom + 2, b));
    }

    /** Closes the svg element. */
    public void end() {
        if (ended) {
            throw new IllegalStateException("chart already ended");
        }
        ended = true;
        w.close("svg");
    }

    /**
     * @return a pixel coordinate with one decimal. Callers draw only what lies on the axes; as a last guard a
     *     non-finite value is written as 0 and a finite one is held within ±{@value #PIXEL_LIMIT}.
     */
    public static String n(double v) {
        if (!Double.isFinite(v)) {
            return "0";
        }
        v = Math.max(-PIXEL_LIMIT, Math.min(PIXEL_LIMIT, v));
        long tenths = Math.round(v * 10);
        long whole = tenths / 10;
        int frac = (int) Math.abs(tenths % 10);
        String sign = tenths < 0 && whole == 0 ? "-" : "";
        return frac == 0 ? sign + whole : sign + whole + "." + frac;
    }
}
