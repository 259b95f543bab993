package settle.experiments.probe;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import settle.engine.minimum.Curvature;
import settle.engine.probe.RangeRule;
import settle.engine.probe.RangeTest;
import settle.reports.html.Axis;
import settle.reports.html.HtmlWriter;
import settle.reports.html.Palette;
import settle.reports.html.ReportPage;
import settle.reports.html.SvgChart;

/**
 * The probe's page, drawn with the report's own pieces (its page skeleton and style sheet, {@link SvgChart},
 * {@link Axis}, the colour-blind-safe {@link Palette}, the escaping {@link HtmlWriter}): the training objective
 * against the rate on a log axis, one line per probe seed with its lowest point marked, the suggested range shaded,
 * the stability bound marked where known; a table of each sweep's reading; and a paragraph saying what the rule did
 * and where it falls short. The words shared with the terminal ({@link #sweepLines}, {@link #why}) are made here.
 */
public final class ProbePage {

    private static final double WIDTH = 880;
    private static final double HEIGHT = 420;
    private static final double LEFT = 64;

    private ProbePage() {
    }

    /** @return the page for {@code r}, the probe of the plan named {@code title}, with one line per arm */
    public static String html(String title, Probe.Result r, List<String> armLines) {
        HtmlWriter w = new HtmlWriter(1 << 16);
        ReportPage.openPage(w, "settle probe: " + title);
        w.open("header");
        w.element("h1", "Rate probe: " + title);
        w.element("p", String.format(Locale.ROOT, "%d sweeps (replicates 1..%d of the plan's seed), each up to %d"
                + " updates with the rate grown geometrically from %s to %s, the training objective measured on the whole"
                + " training split after every update.", r.sweeps().size(), r.sweeps().size(), r.updates(),
                num(r.from()), num(r.to())), "class", "lede");
        w.close("header").newline();
        w.open("main").newline();
        w.open("section", "id", "range");
        w.element("h2", "Suggested initial-rate range: " + num(r.lower()) + " to " + num(r.upper()));
        w.open("ul", "class", "sentences");
        for (String line : why(r)) {
            w.element("li", line);
        }
        String cap = r.capLine();
        if (!cap.isEmpty()) {
            w.element("li", Character.toUpperCase(cap.charAt(0)) + cap.substring(1) + ".");
        }
        w.close("ul");
        chart(w, r);
        legend(w, r);
        table(w, r);
        w.close("section").newline();
        if (!armLines.isEmpty()) {
            w.open("section", "id", "arms");
            w.element("h2", "The plan's arms");
            w.open("ul");
            for (String line : armLines) {
                w.element("li", line);
            }
            w.close("ul");
            w.close("section").newline();
        }
        w.open("section", "id", "rule");
        w.element("h2", "The rule and its limits");
        for (String p : rule(r)) {
            w.element("p", p);
        }
        w.close("section").newline();
        w.close("main").newline();
        w.open("footer");
        w.text("Written by settle probe; no script, nothing fetched.");
        w.close("footer").newline();
        ReportPage.closePage(w);
        return w.toString();
    }

    /** @return why the range has the ends it has, in plain sentences (also printed by the command) */
    public static List<String> why(Probe.Result r) {
        List<String> lines = new ArrayList<>();
        int with = r.withRange();
        if (with == 0) {
            lines.add(r.startsAboveBound() ? "No range: no rate of the sweep lies below the stability bound."
                    : "No range: no sweep went below its starting objective F(θ₀). Start the sweep higher (--from) or"
                            + " sweep further (--to).");
            return lines;
        }
        String of = with == r.sweeps().size() ? "the " + with + " sweeps" : with + " of the " + r.sweeps().size()
                + " sweeps (the others never went below F(θ₀))";
        lines.add("Upper end " + num(r.upper()) + ": " + (r.capped() ? "the sweep's largest rate below the stability"
                + " bound, where the sweeps were still at their lowest objective" : "the median over " + of + " of the"
                + " rate whose update reached the sweep's lowest objective") + ".");
        lines.add("Lower end " + num(r.lower()) + ": the median over " + of + " of the smallest rate by which the sweep"
                + " had made half of its whole fall F(θ₀) − min F.");
        return lines;
    }

    /** @return one line per sweep: how it ended and what it read */
    public static List<String> sweepLines(Probe.Result r) {
        List<String> lines = new ArrayList<>();
        for (int k = 0; k < r.sweeps().size(); k++) {
            RangeTest.Sweep s = r.sweeps().get(k);
            RangeRule.Range g = r.ranges().get(k);
            String reading = g.exists() ? "lowest F " + num(g.lowest()) + " at rate " + num(g.upper()) + ", half the"
                    + " fall by rate " + num(g.lower()) : "never below F(θ₀) " + num(s.initialObjective());
            lines.add("seed " + (k + 1) + ": F(θ₀) " + num(s.initialObjective()) + ", " + reading + "; " + ended(s));
        }
        return lines;
    }

    /** @return how a sweep ended, in words */
    static String ended(RangeTest.Sweep s) {
        int n = s.rates().length;
        return switch (s.end()) {
            case TOP -> "ran to the top of the sweep";
            case ABOVE_START -> "ended at rate " + num(s.rates()[n - 1]) + ", objective above F(θ₀)";
            case NOT_FINITE -> "ended at rate " + num(s.rates()[n - 1]) + ", objective not finite";
            case CEILING -> "ended at the stability bound";
        };
    }

    private static List<String> rule(Probe.Result r) {
        List<String> p = new ArrayList<>();
        p.add("Each sweep starts where the study's replicate of that seed starts and follows its mini-batch order. It"
                + " ends when the objective rises above its starting value F(θ₀) after a real fall (a tenth of F(θ₀) − F(θ*), or of F(θ₀) for a non-convex model), since the sweep has then undone all its"
                + " progress, when the objective is not finite, or, for a convex model, before the first rate at or above"
                + " the stability bound of the mean iterate at θ*, " + Curvature.boundFormula(r.momentum())
                + ", at or above which a constant rate does not settle along H's top direction.");
        p.add("The upper end is the rate whose update brought the sweep to its lowest objective. The lower end is the"
                + " smallest rate by which the sweep had made half of its whole fall: by rate α a geometric sweep has"
                + " taken steps summing to about as much as a short run of a score of updates at α, so below the lower"
                + " end a rate makes comparatively little progress. Both are medians over the seeds.");
        p.add("Limits. A sweep spends one update at each rate, so the ends are about the start of training, not its"
                + " end. A model that gets flatter as it trains can survive rates in the sweep that it cannot start"
                + " with, and one that gets steeper the other way round; non-convex models have no bound to hold the"
                + " upper end. With very small batches the first updates can raise the objective by chance and end a"
                + " sweep early. The lower end moves with the sweep's density (updates per decade). Confirm the upper"
                + " end with a short run at that rate.");
        p.add("The idea of sweeping the rate upward over one short run is L. N. Smith's learning-rate range test"
                + " (\"Cyclical Learning Rates for Training Neural Networks\", WACV 2017); the stops and the reading of"
                + " the sweep are settle's own.");
        return p;
    }

    private static void chart(HtmlWriter w, Probe.Result r) {
        double top = Double.NEGATIVE_INFINITY;
        double low = Double.POSITIVE_INFINITY;
        for (RangeTest.Sweep s : r.sweeps()) {
            top = Math.max(top, s.initialObjective());
            low = Math.min(low, s.initialObjective());
            for (double f : s.objectives()) {
                if (f <= s.initialObjective()) {
                    low = Math.min(low, f);
                }
            }
        }
        // the axis ends at the largest rate a sweep reached (and the bound, where known), not at --to, which the
        // sweeps rarely reach: decades no sweep tried would only squeeze the curves
        double reached = r.from();
        for (RangeTest.Sweep s : r.sweeps()) {
            for (double rate : s.rates()) {
                reached = Math.max(reached, rate);
            }
        }
        double xHigh = Double.isFinite(r.stabilityBound()) ? Math.max(reached, r.stabilityBound()) : reached;
        Axis x = Axis.log(r.from(), Math.min(xHigh, r.from() * 1e11), "rate");
        Axis y = Axis.linear(Math.min(0, low), top, "training objective F");
        SvgChart c = new SvgChart(w, "probe-chart", "chart", WIDTH, HEIGHT, LEFT, x, y,
                "The training objective against the rate for each probe sweep, with the suggested range shaded");
        if (r.withRange() > 0 && Double.isFinite(r.upper())) {
            c.span(r.lower(), r.upper(), "span", "suggested range " + num(r.lower()) + " to " + num(r.upper()));
        }
        if (Double.isFinite(r.stabilityBound())) {
            c.vertical(r.stabilityBound(), new Palette.Style(Palette.REFERENCE, null, Palette.Shape.CIRCLE), "reference",
                    Curvature.boundFormula(r.momentum()) + " = " + num(r.stabilityBound()), "stability bound of the mean"
                    + " iterate at θ*, " + Curvature.boundFormula(r.momentum()) + " = " + num(r.stabilityBound()), 0);
        }
        int off = 0;
        for (int k = 0; k < r.sweeps().size(); k++) {
            RangeTest.Sweep s = r.sweeps().get(k);
            Palette.Style style = Palette.style(k);
            off += c.line(s.rates(), s.objectives(), style, "series");
            RangeRule.Range g = r.ranges().get(k);
            if (g.exists()) {
                c.mark(g.upper(), g.lowest(), style, true, "best", "seed " + (k + 1) + ": lowest objective "
                        + num(g.lowest()) + " at rate " + num(g.upper()));
            }
        }
        c.end();
        w.newline();
        if (off > 0) {
            w.element("p", off + " point" + (off == 1 ? " lies" : "s lie") + " above the drawn range (the updates that"
                    + " ended sweeps above F(θ₀)) and " + (off == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
    }

    private static void legend(HtmlWriter w, Probe.Result r) {
        w.open("ul", "class", "legend");
        for (int k = 0; k < r.sweeps().size(); k++) {
            w.open("li");
            SvgChart.legendSwatch(w, Palette.style(k), true);
            w.text("seed " + (k + 1));
            w.close("li");
        }
        w.open("li");
        w.open("svg", "width", "34", "height", "14", "class", "swatch", "aria-hidden", "true");
        w.empty("rect", "x", "1", "y", "1", "width", "32", "height", "12", "fill", "#5a5a60", "opacity", "0.13");
        w.close("svg");
        w.text("suggested range");
        w.close("li");
        w.close("ul").newline();
    }

    private static void table(HtmlWriter w, Probe.Result r) {
        w.open("table");
        w.element("caption", "Each sweep's reading (marker: its lowest objective)");
        w.open("thead").open("tr");
        for (String h : new String[] {"seed", "F(θ₀)", "lowest F", "at rate (upper end)",
            "half the fall by rate (lower end)", "updates", "how it ended"}) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead");
        w.open("tbody");
        for (int k = 0; k < r.sweeps().size(); k++) {
            RangeTest.Sweep s = r.sweeps().get(k);
            RangeRule.Range g = r.ranges().get(k);
            w.open("tr");
            w.element("td", Integer.toString(k + 1), "class", "num");
            w.element("td", num(s.initialObjective()), "class", "num");
            w.element("td", num(g.lowest()), "class", "num");
            w.element("td", num(g.upper()), "class", "num");
            w.element("td", num(g.lower()), "class", "num");
            w.element("td", Integer.toString(s.rates().length), "class", "num");
            w.element("td", ended(s));
            w.close("tr");
        }
        w.close("tbody");
        w.close("table").newline();
    }

    /** @return a ratio to two significant digits ("1.3", "15", "250") for the plan's arms against the range */
    public static String times(double ratio) {
        return Double.isFinite(ratio) ? new BigDecimal(ratio).round(new MathContext(2)).stripTrailingZeros()
                .toPlainString() : "—";
    }

    /**
     * @return v to four significant digits without trailing zeros, in plain notation from 0.001 to 1e5 and as
     *     1.33e-4 outside it; "—" when not finite (the page's and the terminal's one number format)
     */
    public static String num(double v) {
        if (!Double.isFinite(v)) {
            return "—";
        }
        if (v == 0) {
            return "0";
        }
        double a = Math.abs(v);
        if (a >= 1e-3 && a < 1e5) {
            return new BigDecimal(v).round(new MathContext(4)).stripTrailingZeros().toPlainString();
        }
        String[] parts = String.format(Locale.ROOT, "%.3e", v).split("e");
        String mantissa = new BigDecimal(parts[0]).stripTrailingZeros().toPlainString();
        return mantissa + "e" + Integer.parseInt(parts[1]);
    }
}
