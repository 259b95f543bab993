package settle.experiments.probe;

import java.util.List;
import java.util.Locale;
import settle.engine.minimum.Curvature;
import settle.engine.probe.RangeTest;

/**
 * The probe's small self-contained HTML page: the objective against the rate (log scale) for every sweep as
 * inline SVG, the suggested range and the stability bound marked (with a line when the bound capped the range),
 * and the definitions. No script, no network: a Content-Security-Policy meta tag forbids both; every string from
 * the plan is escaped.
 */
public final class ProbePage {

    private static final int WIDTH = 760;
    private static final int HEIGHT = 420;
    private static final int LEFT = 70;
    private static final int RIGHT = 20;
    private static final int TOP = 20;
    private static final int BOTTOM = 50;
    private static final String[] COLOURS = {"#1f77b4", "#ff7f0e", "#2ca02c", "#d62728", "#9467bd", "#8c564b",
        "#e377c2", "#7f7f7f", "#bcbd22", "#17becf"};

    private ProbePage() {
    }

    /** @return {@code s} escaped for HTML text and attribute values */
    public static String escape(String s) {
        StringBuilder b = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '&' -> b.append("&amp;");
                case '<' -> b.append("&lt;");
                case '>' -> b.append("&gt;");
                case '"' -> b.append("&quot;");
                case '\'' -> b.append("&#39;");
                default -> b.append(c);
            }
        }
        return b.toString();
    }

    /** @return the page for {@code result} of the plan named {@code title} */
    public static String html(String title, Probe.Result r, List<String> armLines) {
        StringBuilder b = new StringBuilder();
        b.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
        b.append("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline';"
                + " img-src data:\">\n");
        b.append("<title>settle probe: ").append(escape(title)).append("</title>\n");
        b.append("<style>body{font-family:sans-serif;max-width:820px;margin:1em auto;color:#222}"
                + "td,th{padding:2px 8px;text-align:right}svg text{font-size:12px}</style>\n</head>\n<body>\n");
        b.append("<h1>Rate range test: ").append(escape(title)).append("</h1>\n");
        b.append(String.format(Locale.ROOT, "<p>%d sweeps (replicates 1..%d of the plan's seed), each %d updates with"
                + " the rate grown geometrically from %s to %s; a sweep stops once the training objective exceeds %s×"
                + " its lowest value so far or is not finite.</p>%n", r.sweeps().size(), r.sweeps().size(), r.updates(),
                num(r.from()), num(r.to()), num(RangeTest.BLOW_UP)));
        b.append(chart(r));
        b.append("<table>\n<tr><th>seed</th><th>largest stable rate</th><th>stopped early</th></tr>\n");
        for (int k = 0; k < r.sweeps().size(); k++) {
            b.append(String.format(Locale.ROOT, "<tr><td>%d</td><td>%s</td><td>%s</td></tr>%n", k + 1,
                    num(r.largestStable()[k]), r.sweeps().get(k).stopped() ? "yes" : "no (top of the sweep)"));
        }
        b.append("</table>\n");
        b.append("<p><b>Suggested initial-rate range: ").append(num(r.lower())).append(" to ").append(num(r.upper()))
                .append("</b>. Upper end: ").append(r.capped() ? "the sweep's largest rate below the stability bound"
                        : "the median over the seeds of the largest stable rate").append("; lower end: a tenth"
                        + " of it.</p>\n");
        if (r.capped()) {
            String line = r.capLine();
            b.append("<p>").append(escape(Character.toUpperCase(line.charAt(0)) + line.substring(1))).append(".</p>\n");
        }
        if (Double.isFinite(r.stabilityBound())) {
            b.append("<p>Stability bound of the mean iterate at θ*, ").append(Curvature.boundFormula(r.momentum()))
                    .append(": ").append(num(r.stabilityBound()))
                    .append(" (dashed).</p>\n");
        } else {
            b.append("<p>No stability bound: ").append(escape(r.boundNote())).append(".</p>\n");
        }
        if (!armLines.isEmpty()) {
            b.append("<ul>\n");
            for (String line : armLines) {
                b.append("<li>").append(escape(line)).append("</li>\n");
            }
            b.append("</ul>\n");
        }
        b.append("<p>The range test is L. N. Smith's, \"Cyclical Learning Rates for Training Neural Networks\","
                + " WACV 2017, which grows the rate linearly; the geometric ramp and the stop at a multiple of the best"
                + " loss are common practice.</p>\n</body>\n</html>\n");
        return b.toString();
    }

    private static String chart(Probe.Result r) {
        double xmin = Math.log10(r.from());
        double xmax = Math.log10(r.to());
        double ymax = 0;
        for (RangeTest.Sweep s : r.sweeps()) {
            ymax = Math.max(ymax, s.initialObjective());
        }
        ymax = ymax > 0 ? ymax * 1.15 : 1;
        int w = WIDTH - LEFT - RIGHT;
        int h = HEIGHT - TOP - BOTTOM;
        StringBuilder b = new StringBuilder();
        b.append(String.format(Locale.ROOT, "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%d\" height=\"%d\""
                + " role=\"img\" aria-label=\"training objective against the rate\">%n", WIDTH, HEIGHT));
        b.append(String.format(Locale.ROOT, "<rect x=\"%d\" y=\"%d\" width=\"%d\" height=\"%d\" fill=\"none\""
                + " stroke=\"#999\"/>%n", LEFT, TOP, w, h));
        for (int e = (int) Math.ceil(xmin); e <= (int) Math.floor(xmax); e++) {
            double x = LEFT + (e - xmin) / (xmax - xmin) * w;
            b.append(String.format(Locale.ROOT, "<line x1=\"%.1f\" y1=\"%d\" x2=\"%.1f\" y2=\"%d\" stroke=\"#eee\"/>"
                    + "<text x=\"%.1f\" y=\"%d\" text-anchor=\"middle\">1e%d</text>%n", x, TOP, x, TOP + h, x,
                    TOP + h + 16, e));
        }
        for (int i = 0; i <= 4; i++) {
            double v = ymax * i / 4;
            double y = TOP + h - v / ymax * h;
            b.append(String.format(Locale.ROOT, "<text x=\"%d\" y=\"%.1f\" text-anchor=\"end\">%s</text>%n", LEFT - 6,
                    y + 4, num(v)));
        }
        b.append(String.format(Locale.ROOT, "<text x=\"%d\" y=\"%d\" text-anchor=\"middle\">rate (log scale)</text>%n",
                LEFT + w / 2, HEIGHT - 8));
        b.append(String.format(Locale.ROOT, "<text x=\"14\" y=\"%d\" transform=\"rotate(-90 14 %d)\""
                + " text-anchor=\"middle\">training objective</text>%n", TOP + h / 2, TOP + h / 2));
        double lo = LEFT + (Math.log10(r.lower()) - xmin) / (xmax - xmin) * w;
        double hi = LEFT + (Math.log10(r.upper()) - xmin) / (xmax - xmin) * w;
        if (Double.isFinite(lo) && Double.isFinite(hi)) {
            b.append(String.format(Locale.ROOT, "<rect x=\"%.1f\" y=\"%d\" width=\"%.1f\" height=\"%d\" fill=\"#2ca02c\""
                    + " fill-opacity=\"0.12\"><title>suggested range</title></rect>%n", lo, TOP, Math.max(1, hi - lo), h));
        }
        if (Double.isFinite(r.stabilityBound()) && r.stabilityBound() > r.from() && r.stabilityBound() < r.to()) {
            double x = LEFT + (Math.log10(r.stabilityBound()) - xmin) / (xmax - xmin) * w;
            b.append(String.format(Locale.ROOT, "<line x1=\"%.1f\" y1=\"%d\" x2=\"%.1f\" y2=\"%d\" stroke=\"#333\""
                    + " stroke-dasharray=\"5,4\"><title>%s</title></line>%n", x, TOP, x, TOP + h,
                    Curvature.boundFormula(r.momentum())));
        }
        for (int k = 0; k < r.sweeps().size(); k++) {
            RangeTest.Sweep s = r.sweeps().get(k);
            StringBuilder pts = new StringBuilder();
            for (int i = 0; i < s.rates().length; i++) {
                double f = s.objectives()[i];
                double v = Double.isFinite(f) ? Math.min(f, ymax) : ymax;
                double x = LEFT + (Math.log10(s.rates()[i]) - xmin) / (xmax - xmin) * w;
                double y = TOP + h - v / ymax * h;
                pts.append(String.format(Locale.ROOT, "%.1f,%.1f ", x, y));
            }
            b.append(String.format(Locale.ROOT, "<polyline fill=\"none\" stroke=\"%s\" stroke-width=\"1.5\""
                    + " points=\"%s\"><title>seed %d</title></polyline>%n", COLOURS[k % COLOURS.length],
                    pts.toString().trim(), k + 1));
        }
        b.append("</svg>\n");
        return b.toString();
    }

    static String num(double v) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%.4g", v) : "—";
    }
}
