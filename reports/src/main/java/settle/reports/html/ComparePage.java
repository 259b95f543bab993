package settle.reports.html;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import settle.reports.compare.CrossStudy;
import settle.reports.compare.StudyDigest;
import settle.reports.format.Metric;
import settle.reports.stats.Comparison;
import settle.reports.stats.VerdictSentence;
import settle.reports.stats.VerdictSentence.Outcome;
import settle.reports.text.Format;
import settle.reports.text.Names;

/**
 * The page of {@code settle compare}: one self-contained file like {@code report.html} (the same head, policy, style
 * sheet and escaping), with three sections in reading order: {@code summary} (one sentence per arm present in several
 * studies, and each study's pick), {@code forest} (per such arm a forest plot, {@code svg.forest}: one row per study,
 * {@code g.forest-row}, its effect and interval against that study's baseline, a line at no change) and
 * {@code studies} (what each study trained). Studies with another baseline or primary metric are a group of their
 * own, with the reason.
 */
public final class ComparePage {

    /** Section ids, in page order. */
    public static final List<String> SECTIONS = List.of("summary", "forest", "studies");

    /** Colour of an effect detected in the arm's favour (ends closer), of one against it, and of neither. */
    static final String CLOSER = "#0072B2";
    static final String FARTHER = "#D55E00";
    static final String UNDECIDED = "#6b6b73";

    private static final String CSS = """
            ul.summary > li { margin: 6px 0; }
            .apart { background: #f4f4f6; border-left: 4px solid #9a9aa2; padding: 6px 10px; max-width: none; }
            figure.forest-figure { margin: 10px 0 22px; }
            figure.forest-figure figcaption { font-size: 0.92em; color: var(--muted); max-width: 100ch; }
            figure.forest-figure h3 { margin-bottom: 2px; }
            svg.forest { display: block; max-width: 100%; height: auto; font-size: 12px; }
            svg.forest .zero { stroke: #333333; stroke-dasharray: 4 3; }
            svg.forest .effect-text { fill: var(--ink); }
            svg.forest .picked-text { fill: #0072B2; font-weight: 600; }
            svg.forest .interval { stroke-width: 2.2; }
            table.studies td.budget { min-width: 24ch; }
            table.studies td.model, table.studies td.data { min-width: 18ch; }
            table.studies td.directory { overflow-wrap: anywhere; max-width: 28ch; }
            span.key { display: inline-block; width: 10px; height: 10px; margin: 0 4px 0 12px; vertical-align: -1px; }
            """;

    private static final double WIDTH = 1100;
    private static final double LABEL = 250;
    private static final double PLOT_LEFT = 262;
    private static final double PLOT_RIGHT = 700;
    private static final double TEXT_LEFT = 716;
    private static final double ROW = 26;
    private static final double TOP = 8;
    private static final double AXIS = 40;

    /** % changes that may label the forest plots' axis. */
    private static final double[] TICKS = {-99.9, -99, -95, -90, -80, -50, -20, 0, 25, 100, 400, 900, 9900};

    private final CrossStudy c;
    private final HtmlWriter w = new HtmlWriter(1 << 16);

    private ComparePage(CrossStudy c) {
        this.c = c;
    }

    /**
     * @param c the studies side by side
     * @return the page
     */
    public static String render(CrossStudy c) {
        ComparePage p = new ComparePage(c);
        p.page();
        return p.w.toString();
    }

    private void page() {
        ReportPage.openPage(w, "settle compare: " + c.studies().size() + " studies", CSS);
        w.open("header");
        w.element("h1", c.studies().size() + " studies side by side: does decay help across them?");
        w.element("p", "Each arm's effect on where its returned iterate ends, against its own study's baseline, as"
                + " that study's verdict gives it: the Hodges–Lehmann change, its exact interval at the study's"
                + " Bonferroni level, and the adjusted p. Arms are matched by name.", "class", "lede");
        w.open("nav").open("ul");
        String[] names = {"Summary", "Forest plots", "The studies"};
        for (int i = 0; i < SECTIONS.size(); i++) {
            w.open("li").element("a", names[i], "href", "#" + SECTIONS.get(i)).close("li");
        }
        w.close("ul").close("nav");
        w.close("header").newline();
        w.open("main").newline();
        summary();
        forest();
        studies();
        w.close("main").newline();
        w.open("footer");
        w.text("Written by settle compare from the study directories: " + String.join(", ",
                c.studies().stream().map(d -> d.directory().toString()).toList()) + ".");
        w.close("footer").newline();
        ReportPage.closePage(w);
    }

    private void summary() {
        w.open("section", "id", "summary").newline();
        w.element("h2", "What the studies say");
        for (int i = 0; i < c.groups().size(); i++) {
            CrossStudy.Group g = c.groups().get(i);
            if (c.groups().size() > 1) {
                w.element("h3", groupTitle(i, g));
            }
            if (!g.why().isEmpty()) {
                w.element("p", g.why(), "class", "apart");
            }
            if (g.arms().isEmpty()) {
                w.element("p", "No arm other than the baseline is in two of these studies: nothing to set side by side.");
            } else {
                w.open("ul", "class", "summary");
                for (CrossStudy.SharedArm a : g.arms()) {
                    w.element("li", a.sentence());
                }
                w.close("ul");
            }
            List<String> picks = new ArrayList<>();
            for (int s : g.studies()) {
                StudyDigest d = c.studies().get(s);
                picks.add(Names.shown(c.labels().get(s)) + " picks " + (d.pick() == null ? "none (it keeps the baseline)"
                        : Names.shown(d.pick())));
            }
            w.element("p", "Picks: " + String.join("; ", picks) + ".");
        }
        incomplete();
        w.element("p", "Nothing is pooled: there is no p-value across studies. Each study's adjusted p and interval"
                + " hold for that study (its data, model, budget and seeds); the counts above say in how many studies"
                + " the effect was detected, not how likely it is elsewhere. \"Undecided\" means no difference was"
                + " detected (or the test and its interval disagreed), never that there is none.", "class", "note");
        w.close("section").newline();
    }

    private void incomplete() {
        List<String> parts = new ArrayList<>();
        for (int s = 0; s < c.studies().size(); s++) {
            StudyDigest d = c.studies().get(s);
            if (d.missing() > 0) {
                parts.add(Names.shown(c.labels().get(s)) + " is partial (" + d.missing() + " replicate"
                        + (d.missing() == 1 ? "" : "s") + " missing; its verdict pairs " + d.pairs() + ")");
            }
            if (d.diverged() > 0) {
                parts.add(Names.shown(c.labels().get(s)) + " has " + d.diverged() + " diverged replicate"
                        + (d.diverged() == 1 ? "" : "s") + " (counted as the worst value)");
            }
        }
        if (!parts.isEmpty()) {
            w.element("p", String.join("; ", parts) + ".", "class", "warning");
        }
    }

    private String groupTitle(int i, CrossStudy.Group g) {
        return "Group " + (i + 1) + ": baseline " + Names.shown(g.baseline()) + ", " + g.primary().words() + " ("
                + g.studies().size() + " stud" + (g.studies().size() == 1 ? "y" : "ies") + ")";
    }

    private void forest() {
        w.open("section", "id", "forest").newline();
        w.element("h2", "Effects study by study");
        w.open("p");
        w.text("One plot per arm, one row per study: the change of the primary metric against that study's baseline"
                + " (the point) and its interval (the bar); left of the dashed line the arm ends closer. ");
        key(CLOSER, "detectably closer");
        key(FARTHER, "detectably farther");
        key(UNDECIDED, "undecided");
        w.close("p");
        int figure = 0;
        for (int i = 0; i < c.groups().size(); i++) {
            CrossStudy.Group g = c.groups().get(i);
            if (c.groups().size() > 1) {
                w.element("h3", groupTitle(i, g));
            }
            if (g.arms().isEmpty()) {
                w.element("p", "No arm other than the baseline is in two of these studies.", "class", "note");
            }
            for (CrossStudy.SharedArm a : g.arms()) {
                plot(figure++, g, a);
            }
            if (!g.single().isEmpty()) {
                List<String> only = new ArrayList<>();
                for (Map.Entry<String, Integer> e : g.single().entrySet()) {
                    only.add(Names.shown(e.getKey()) + " (" + Names.shown(c.labels().get(e.getValue())) + ")");
                }
                w.element("p", "In one study only, so not plotted: " + String.join(", ", only) + ".", "class", "note");
            }
        }
        w.close("section").newline();
    }

    private void key(String colour, String words) {
        w.open("span", "class", "key", "style", "background:" + colour).close("span");
        w.text(words);
    }

    /**
     * @return the axis of a group's forest plots, shared so that the plots read against each other: from the
     *     smallest to the largest log ratio of any estimate or interval end, no change included, padded by 5 %
     */
    private static double[] axis(CrossStudy.Group g) {
        double lo = 0;
        double hi = 0;
        for (CrossStudy.SharedArm a : g.arms()) {
            for (CrossStudy.Row r : a.rows()) {
                Comparison k = r.effect().comparison();
                if (k == null || k.effectPairs() == 0 || !Double.isFinite(k.estimate())) {
                    continue;
                }
                lo = Math.min(lo, k.estimate());
                hi = Math.max(hi, k.estimate());
                if (k.exact().isDefined()) {
                    lo = Math.min(lo, k.exact().low());
                    hi = Math.max(hi, k.exact().high());
                }
            }
        }
        if (hi - lo < 0.2) {
            double mid = (hi + lo) / 2;
            lo = Math.min(lo, mid - 0.1);
            hi = Math.max(hi, mid + 0.1);
        }
        double pad = 0.05 * (hi - lo);
        return new double[] {lo - pad, hi + pad};
    }

    /** One arm's forest plot. */
    private void plot(int index, CrossStudy.Group g, CrossStudy.SharedArm a) {
        w.open("figure", "class", "forest-figure");
        w.element("h3", Names.shown(a.name()) + " against " + Names.shown(g.baseline()));
        double[] range = axis(g);
        final double low = range[0];
        final double high = range[1];
        int rows = a.rows().size();
        double height = TOP + rows * ROW + AXIS;
        w.open("svg", "class", "chart forest", "id", "forest-" + (index + 1),
                "viewBox", "0 0 " + SvgChart.n(WIDTH) + " " + SvgChart.n(height), "width", SvgChart.n(WIDTH),
                "height", SvgChart.n(height), "role", "img", "aria-label", "forest plot of " + a.name());
        double bottom = TOP + rows * ROW;
        for (int r = 0; r < rows; r++) {
            CrossStudy.Row row = a.rows().get(r);
            double y = TOP + r * ROW + ROW / 2;
            Comparison k = row.effect().comparison();
            Outcome o = row.effect().outcome();
            String colour = o == Outcome.LOWER ? CLOSER : o == Outcome.HIGHER ? FARTHER : UNDECIDED;
            w.open("g", "class", "forest-row", "data-outcome", o.name().toLowerCase(java.util.Locale.ROOT));
            if (r % 2 == 0) {
                w.empty("rect", "class", "row-shade", "x", "0", "y", SvgChart.n(TOP + r * ROW), "width",
                        SvgChart.n(WIDTH), "height", SvgChart.n(ROW), "fill", "#f6f6f8");
            }
            w.element("text", Names.shown(c.labels().get(row.study())), "x", SvgChart.n(LABEL), "y",
                    SvgChart.n(y + 4), "text-anchor", "end", "class", "row-label");
            boolean effect = k != null && k.effectPairs() > 0 && Double.isFinite(k.estimate());
            if (effect && k.exact().isDefined()) {
                w.empty("line", "class", "interval", "x1", SvgChart.n(x(k.exact().low(), low, high)), "x2",
                        SvgChart.n(x(k.exact().high(), low, high)), "y1", SvgChart.n(y), "y2", SvgChart.n(y), "stroke",
                        colour);
            }
            if (effect) {
                SvgChart.marker(w, x(k.estimate(), low, high), y, 5, Palette.Shape.SQUARE, colour,
                        o == Outcome.LOWER || o == Outcome.HIGHER, "estimate", VerdictSentence.detail(k));
            }
            w.element("text", effectText(k), "x", SvgChart.n(TEXT_LEFT), "y", SvgChart.n(y + 4), "class",
                    "effect-text");
            if (row.effect().picked()) {
                w.element("text", "picked", "x", SvgChart.n(WIDTH - 6), "y", SvgChart.n(y + 4), "text-anchor", "end",
                        "class", "picked-text");
            }
            w.close("g");
        }
        w.empty("line", "class", "zero", "x1", SvgChart.n(x(0, low, high)), "x2", SvgChart.n(x(0, low, high)), "y1",
                SvgChart.n(TOP), "y2", SvgChart.n(bottom));
        w.empty("line", "class", "frame", "x1", SvgChart.n(PLOT_LEFT), "x2", SvgChart.n(PLOT_RIGHT), "y1",
                SvgChart.n(bottom), "y2", SvgChart.n(bottom), "stroke", "#9a9aa2");
        for (double t : ticks(low, high)) {
            double px = x(Math.log1p(t / 100), low, high);
            w.empty("line", "x1", SvgChart.n(px), "x2", SvgChart.n(px), "y1", SvgChart.n(bottom), "y2",
                    SvgChart.n(bottom + 4), "stroke", "#9a9aa2");
            w.element("text", Format.percent(t), "x", SvgChart.n(px), "y", SvgChart.n(bottom + 16), "text-anchor",
                    "middle", "class", "tick");
        }
        w.element("text", "change of the " + g.primary().words() + " against the baseline (log scale)", "x",
                SvgChart.n((PLOT_LEFT + PLOT_RIGHT) / 2), "y", SvgChart.n(bottom + 33), "text-anchor", "middle",
                "class", "axis-title");
        w.close("svg");
        w.element("figcaption", a.sentence());
        w.close("figure").newline();
    }

    /**
     * @param k an arm's comparison with its study's baseline on the primary metric (null: not compared)
     * @return the effect as the plot's right column and the terminal show it: "−92 % (−97 to −77 %, 99 %), adjusted p
     *     0.0049"
     */
    public static String effectText(Comparison k) {
        if (k == null || k.effectPairs() == 0 || !Double.isFinite(k.estimate())) {
            return "not compared: no usable pair of replicates";
        }
        String p = (k.arms() > 1 ? "adjusted p " : "p ") + Format.p(k.arms() > 1 ? k.pAdjusted() : k.p());
        if (!k.exact().isDefined()) {
            return Format.percent(k.change()) + ", no interval (too few pairs), " + p;
        }
        return Format.percent(k.change()) + " (" + Format.percentRange(k.scale().shown(k.exact().low()),
                k.scale().shown(k.exact().high())) + ", " + level(k) + "), " + p;
    }

    private static String level(Comparison k) {
        double pct = 100 * k.level();
        String s = Math.abs(pct - Math.rint(pct)) < 1e-9 ? Long.toString(Math.round(pct))
                : new java.math.BigDecimal(pct).round(new java.math.MathContext(3)).stripTrailingZeros().toPlainString();
        return s + " %";
    }

    private static double x(double d, double low, double high) {
        return PLOT_LEFT + (d - low) / (high - low) * (PLOT_RIGHT - PLOT_LEFT);
    }

    /**
     * @return the % changes to label on an axis from log ratio {@code low} to {@code high}: no change first, then the
     *     candidates from the ends inwards, each kept only when it lies at least 46 pixels from every label kept
     */
    private static List<Double> ticks(double low, double high) {
        List<Double> candidates = new ArrayList<>();
        for (double t : TICKS) {
            double d = Math.log1p(t / 100);
            if (d >= low && d <= high) {
                candidates.add(t);
            }
        }
        candidates.sort((a, b) -> Double.compare(Math.abs(Math.log1p(b / 100)), Math.abs(Math.log1p(a / 100))));
        candidates.remove(0.0);
        candidates.add(0, 0.0);
        List<Double> kept = new ArrayList<>();
        for (double t : candidates) {
            double px = x(Math.log1p(t / 100), low, high);
            boolean clear = true;
            for (double k : kept) {
                clear &= Math.abs(x(Math.log1p(k / 100), low, high) - px) >= 46;
            }
            if (clear) {
                kept.add(t);
            }
        }
        kept.sort(Double::compare);
        return kept;
    }

    private void studies() {
        w.open("section", "id", "studies").newline();
        w.element("h2", "The studies");
        w.open("div", "class", "scroll");
        w.open("table", "class", "studies");
        w.open("thead").open("tr");
        for (String h : List.of("study", "data", "model", "budget", "replicates", "baseline", "primary metric",
                "pick", "directory")) {
            w.element("th", h);
        }
        w.close("tr").close("thead");
        w.open("tbody");
        for (int s = 0; s < c.studies().size(); s++) {
            StudyDigest d = c.studies().get(s);
            w.open("tr");
            w.element("th", Names.shown(c.labels().get(s)), "class", "arm");
            w.element("td", d.dataSource() + " (" + d.trainRows() + " training rows, " + d.testRows() + " test rows)",
                    "class", "data");
            w.element("td", d.model(), "class", "model");
            w.element("td", d.budget(), "class", "budget");
            w.element("td", d.replicates() + " per arm × " + (d.arms().size() + 1) + " arms"
                    + (d.pairs() < d.replicates() ? " (" + d.pairs() + " paired)" : ""), "class", "num");
            w.element("td", Names.shown(d.baseline()));
            w.element("td", d.primary().words() + (d.primary() == Metric.FINAL_GAP ? " (convex)" : ""));
            w.element("td", d.pick() == null ? "none" : Names.shown(d.pick()));
            w.element("td", d.directory().toString(), "class", "directory");
            w.close("tr");
        }
        w.close("tbody");
        w.close("table");
        w.close("div");
        w.close("section").newline();
    }
}
