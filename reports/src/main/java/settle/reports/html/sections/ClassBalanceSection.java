package settle.reports.html.sections;

import java.util.Locale;
import settle.reports.format.Metric;
import settle.reports.format.Study;
import settle.reports.html.HtmlWriter;
import settle.reports.metrics.ClassBalance;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Comparison;
import settle.reports.stats.Interval;
import settle.reports.text.Format;
import settle.reports.text.Names;

/**
 * "Class balance": per arm the balanced accuracy (the mean recall over the classes) and each class's recall on the
 * test split, compared with the baseline like the test accuracy (paired by seed, in percentage points), and a warning
 * when a class has fewer than {@value ClassBalance#FEW_TEST_ROWS} test rows ({@link ClassBalance}).
 */
final class ClassBalanceSection implements Section {

    @Override
    public String id() {
        return "classes";
    }

    @Override
    public String navigation() {
        return "Classes";
    }

    @Override
    public String heading() {
        return "Class balance";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        StudyAnalysis analysis = d.analysis();
        Study study = d.study();
        ClassBalance cb = analysis.classBalance();
        if (cb == null) {
            d.para(study.encoding() == null ? "This study directory records no test labels (it was written before"
                    + " settle kept encoding.json); run its plan again with --out the same directory to add them."
                    : "The study has no test rows, so there is no recall to show.");
            return;
        }
        int[] counts = cb.testCounts();
        StringBuilder rows = new StringBuilder();
        for (int c = 0; c < counts.length; c++) {
            rows.append(c == 0 ? "" : ", ").append(Names.shown(cb.classNames().get(c))).append(' ').append(counts[c]);
        }
        d.para("Recall of a class: the fraction of its test rows whose most probable class is theirs. Balanced"
                + " accuracy: the mean recall over the classes, each class counting the same however many rows it"
                + " has; beside the test accuracy it shows whether an arm buys accuracy on the large classes at the"
                + " small ones' cost. Test rows per class: " + rows + ".");
        if (!cb.caution().isEmpty()) {
            w.element("p", "Warning: " + cb.caution() + ".", "class", "warning");
        }
        int base = study.manifest().baselineIndex();
        String level = level(cb, base, study.armCount());
        w.open("div", "class", "scroll");
        w.open("table", "class", "verdict-table");
        w.open("caption").text("Per arm: medians over finished replicates [interquartile range], in %; changes against"
                + " the baseline in percentage points, paired by seed (Hodges–Lehmann), with exact intervals at the"
                + " adjusted level " + level + " and Bonferroni-adjusted p over the arms, as for the test accuracy."
                + " A diverged replicate counts as worst.").close("caption");
        d.tableHead("arm", "balanced accuracy", "change", "exact " + level + " CI", "adjusted p (p)",
                "test accuracy");
        w.open("tbody");
        ArmSummary[] accuracy = analysis.summaries(Metric.TEST_ACCURACY);
        for (int a = 0; a < study.armCount(); a++) {
            w.open("tr", "class", a == base ? "baseline" : null);
            w.open("th", "scope", "row", "class", "arm");
            d.swatch(a);
            w.text(study.armName(a) + (a == base ? " (baseline)" : ""));
            w.close("th");
            w.element("td", percentCell(cb.balanced(a)), "class", "num");
            comparisonCells(w, cb.balancedComparison(a, base), a == base);
            w.element("td", accuracy == null ? "—" : percentCell(accuracy[a]), "class", "num");
            w.close("tr");
        }
        w.close("tbody");
        w.close("table");
        w.close("div");

        w.open("div", "class", "scroll");
        w.open("table", "class", "verdict-table");
        w.open("caption").text("Recall per class and arm: median over finished replicates in %; in brackets, the change"
                + " against the baseline in percentage points (bold: detected at adjusted p ≤ "
                + Format.sig(analysis.options().significance()) + ").").close("caption");
        String[] head = new String[counts.length + 1];
        head[0] = "arm";
        for (int c = 0; c < counts.length; c++) {
            head[c + 1] = Names.shown(cb.classNames().get(c)) + " (" + counts[c] + " test row"
                    + (counts[c] == 1 ? "" : "s") + ")";
        }
        d.tableHead(head);
        w.open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            w.open("tr", "class", a == base ? "baseline" : null);
            d.armHeader(a);
            for (int c = 0; c < counts.length; c++) {
                ArmSummary s = cb.recall(a, c);
                Comparison cmp = cb.recallComparison(a, c, base);
                String cell = s == null ? "—" : percent(s.median());
                if (cmp != null) {
                    cell += " (" + points(cmp.change()) + ")";
                }
                w.element("td", cell, "class", cmp != null && cmp.detected() ? "num detected" : "num");
            }
            w.close("tr");
        }
        w.close("tbody");
        w.close("table");
        w.close("div");
    }

    private static String level(ClassBalance cb, int base, int arms) {
        for (int a = 0; a < arms; a++) {
            Comparison c = cb.balancedComparison(a, base);
            if (c != null) {
                return Format.sig(100 * c.level()) + " %";
            }
        }
        return "95 %";
    }

    private static void comparisonCells(HtmlWriter w, Comparison c, boolean baseline) {
        if (c == null) {
            for (int i = 0; i < 3; i++) {
                w.element("td", baseline ? "" : "—", "class", "num");
            }
            return;
        }
        w.element("td", c.effectPairs() > 0 ? points(c.change()) : "—", "class", "num");
        w.element("td", range(c.exact()), "class", "num");
        w.element("td", Format.p(c.pAdjusted()) + " (" + Format.p(c.p()) + ")", "class",
                c.detected() ? "num detected" : "num");
    }

    /** @return "median [IQR]" of a fraction, in %, or "—" when no replicate finished */
    private static String percentCell(ArmSummary s) {
        if (!Double.isFinite(s.median())) {
            return "—";
        }
        return percent(s.median()) + " [" + String.format(Locale.ROOT, "%.1f", 100 * s.interquartileRange()) + "]";
    }

    /** @return a fraction as a percentage with one decimal: "87.5 %" */
    private static String percent(double fraction) {
        return Double.isFinite(fraction) ? String.format(Locale.ROOT, "%.1f %%", 100 * fraction) : "—";
    }

    /** @return a change in percentage points with its sign and one decimal: "+1.2 pp", "−0.4 pp", "0 pp" */
    static String points(double pp) {
        if (!Double.isFinite(pp)) {
            return "—";
        }
        String s = String.format(Locale.ROOT, "%.1f", Math.abs(pp));
        if (s.equals("0.0")) {
            return "0 pp";
        }
        return (pp < 0 ? "−" : "+") + s + " pp";
    }

    /** @return an interval of differences (fractions) as percentage points, or "—" when undefined */
    private static String range(Interval i) {
        if (!i.isDefined()) {
            return "—";
        }
        return points(100 * i.low()).replace(" pp", "") + " to " + points(100 * i.high());
    }
}
