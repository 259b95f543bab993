package settle.reports.html.sections;

import java.util.ArrayList;
import java.util.List;
import settle.reports.html.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.metrics.ArmLevel;
import settle.reports.metrics.ArmPick;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Comparison;
import settle.reports.stats.Interval;
import settle.reports.stats.VerdictSentence;
import settle.reports.study.Manifest;
import settle.reports.study.Metric;
import settle.reports.study.Study;

/**
 * "Verdict": which arm to pick ({@link ArmPick}) and at what cost, one sentence per arm against the baseline on the
 * primary metric with descriptive sentences on the others, how many replicates a verdict needs, and the verdict
 * table.
 */
final class VerdictSection implements Section {

    @Override
    public String id() {
        return "verdict";
    }

    @Override
    public String navigation() {
        return "Verdict";
    }

    @Override
    public String heading() {
        return "Verdict";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        Manifest manifest = d.manifest();
        StudyAnalysis analysis = d.analysis();
        int base = manifest.baselineIndex();
        String baseline = manifest.baseline();
        List<Comparison> primary = analysis.comparisons(analysis.primary());
        if (study.armCount() == 1) {
            d.para("The plan has only the baseline arm " + baseline + ": there is nothing to compare it with.");
        } else if (primary.isEmpty()) {
            d.para("No replicate index is present in every arm, so no arm can be compared with the baseline.");
        } else {
            pick(d, base);
            w.element("h3", "Each arm against the baseline " + baseline);
            w.open("ul", "class", "sentences");
            for (int a = 0; a < study.armCount(); a++) {
                if (a == base) {
                    continue;
                }
                w.open("li");
                w.element("strong", study.armName(a));
                Comparison c = analysis.comparison(analysis.primary(), a);
                w.text(" " + VerdictSentence.render(c) + ".");
                List<String> more = new ArrayList<>();
                for (Metric m : analysis.compared()) {
                    Comparison other = m == analysis.primary() ? null : analysis.comparison(m, a);
                    if (other != null) {
                        more.add(withMetric(m, VerdictSentence.render(other)));
                    }
                }
                if (!more.isEmpty()) {
                    w.open("ul", "class", "descriptive");
                    for (String s : more) {
                        w.element("li", s);
                    }
                    w.close("ul");
                }
                w.close("li");
            }
            w.close("ul");
            int n = analysis.pairedReplicates().length;
            int needed = analysis.replicatesNeeded();
            int m = analysis.comparedArms();
            String power = "With " + m + " arm" + (m == 1 ? "" : "s") + " compared with the baseline (Holm across "
                    + "arms), the smallest adjusted p an exact signed-rank test can reach with n pairs is " + m
                    + "·2/2ⁿ, so a verdict needs at least " + needed + " replicates; this study pairs " + n + ".";
            if (n < needed) {
                power += " It has fewer: \"no difference detected\" here is not evidence that there is none.";
            }
            w.element("p", power, "class", "note");
            w.element("p", "Tail radius is the primary metric: the test is the exact Wilcoxon signed-rank test on the "
                    + "paired log-ratios, Holm-adjusted across arms; the effect is the Hodges–Lehmann estimate of "
                    + "the log-ratio shown as a % change with its exact 95 % interval (a percentile bootstrap "
                    + "interval, 10 000 resamples, beside it in the table). The other metrics are descriptive. A "
                    + "diverged replicate counts as worse than every finite value.", "class", "note");
        }
        verdictTable(d, base);
    }

    /**
     * The pick: the arm {@link ArmPick} recommends and at what cost in test loss, test accuracy and final gap, or, when
     * none, the arm with the lowest median and what a verdict would need.
     */
    private static void pick(Drawing d, int base) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        Manifest manifest = d.manifest();
        StudyAnalysis analysis = d.analysis();
        ArmPick pick = ArmPick.of(analysis);
        ArmSummary[] radius = analysis.summaries(analysis.primary());
        w.open("div", "class", "pick");
        if (!pick.picked()) {
            int lowest = pick.lowest();
            w.open("p");
            w.text("No arm wanders detectably less than the baseline ");
            w.element("strong", manifest.baseline());
            w.text(" (tail radius, Holm-adjusted p ≤ 0.05). The lowest median tail radius is "
                    + Format.sig(radius[lowest].median()) + ", of ");
            w.element("strong", study.armName(lowest));
            w.text(". Keep the baseline, or run more replicates"
                    + (analysis.pairedReplicates().length < analysis.replicatesNeeded()
                            ? " (at least " + analysis.replicatesNeeded() + " are needed for a verdict at this number "
                                    + "of arms)"
                            : "") + ".");
            w.close("p");
        } else {
            int best = pick.arm();
            Comparison c = analysis.comparison(analysis.primary(), best);
            w.open("p");
            w.text("For low wander, pick ");
            w.element("strong", study.armName(best));
            w.text(": among the arms that detectably wander less than the baseline " + manifest.baseline()
                    + ", it has the smallest median tail radius (" + Format.sig(radius[best].median()) + " against "
                    + Format.sig(radius[base].median()) + "); it " + VerdictSentence.render(c) + ".");
            w.close("p");
            w.open("p");
            w.text("At what cost: ");
            List<String> costs = new ArrayList<>();
            for (Metric m : List.of(Metric.TEST_LOSS, Metric.TEST_ACCURACY, Metric.FINAL_GAP)) {
                Comparison cost = analysis.comparison(m, best);
                ArmSummary[] s = analysis.summaries(m);
                if (cost == null || s == null) {
                    continue;
                }
                costs.add(withMetric(m, VerdictSentence.render(cost)) + " (median " + Format.sig(s[best].median())
                        + " against " + Format.sig(s[base].median()) + ")");
            }
            w.text(costs.isEmpty() ? "no test split or reference to measure it on." : String.join("; ", costs) + ".");
            w.close("p");
        }
        w.close("div");
    }

    /** @return the sentence, prefixed with the metric's name when it does not say it */
    private static String withMetric(Metric m, String sentence) {
        return sentence.contains(m.words()) ? sentence : m.words() + ": " + sentence;
    }

    /**
     * The verdict table: per arm the median [IQR] of the primary metric, its comparison with the baseline, the medians
     * of final gap, test loss and test accuracy, and the arm-level spreads with their intervals.
     */
    private static void verdictTable(Drawing d, int base) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        StudyAnalysis analysis = d.analysis();
        w.open("div", "class", "scroll");
        w.open("table", "class", "verdict-table");
        w.open("caption").text("Per arm: medians over finished replicates [interquartile range]; changes against the "
                + "baseline paired by seed; arm-level spreads with joint bootstrap 95 % intervals.").close("caption");
        d.tableHead("arm", "tail radius", "change", "exact 95 % CI", "bootstrap 95 % CI", "adjusted p (p)",
                "P(beats baseline)", "final gap", "test loss", "test accuracy", "seed spread", "prediction spread",
                "disagreement");
        w.open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            w.open("tr", "class", a == base ? "baseline" : null);
            w.open("th", "scope", "row", "class", "arm");
            d.swatch(a);
            w.text(study.armName(a) + (a == base ? " (baseline)" : ""));
            w.close("th");
            w.element("td", summaryCell(d, analysis.primary(), a), "class", "num");
            Comparison c = analysis.comparison(analysis.primary(), a);
            if (c == null) {
                for (int i = 0; i < 5; i++) {
                    w.element("td", a == base ? "" : "—", "class", "num");
                }
            } else {
                w.element("td", c.effectPairs() > 0 ? Format.percent(c.percentChange()) : "—", "class", "num");
                w.element("td", range(c.exact()), "class", "num");
                w.element("td", range(c.bootstrap()), "class", "num");
                w.element("td", Format.p(c.pAdjusted()) + " (" + Format.p(c.p()) + ")", "class",
                        c.detected() ? "num detected" : "num");
                w.element("td", Format.sig(c.probabilityBetter()), "class", "num");
            }
            w.element("td", summaryCell(d, Metric.FINAL_GAP, a), "class", "num");
            w.element("td", summaryCell(d, Metric.TEST_LOSS, a), "class", "num");
            w.element("td", summaryCell(d, Metric.TEST_ACCURACY, a), "class", "num");
            w.element("td", levelCell(analysis.seedSpread(a)), "class", "num");
            w.element("td", levelCell(analysis.predictionSpread(a)), "class", "num");
            w.element("td", levelCell(analysis.disagreement(a)), "class", "num");
            w.close("tr");
        }
        w.close("tbody");
        w.close("table");
        w.close("div");
    }

    /** @return an interval of log-ratios as a range of % changes, or "—" when undefined */
    private static String range(Interval i) {
        return i.isDefined() ? Format.percentRange(Comparison.percent(i.low()), Comparison.percent(i.high())) : "—";
    }

    /** @return "median [IQR]" of metric m for arm a, or "—" when the metric is unavailable */
    private static String summaryCell(Drawing d, Metric m, int a) {
        StudyAnalysis analysis = d.analysis();
        ArmSummary[] s = analysis.summaries(m);
        if (s == null) {
            return "—";
        }
        ArmSummary x = s[a];
        return Format.sig(x.median()) + " [" + Format.sig(x.interquartileRange()) + "]";
    }

    /** @return an arm-level value with its interval when defined, or "—" when it cannot be computed */
    private static String levelCell(ArmLevel v) {
        if (!Double.isFinite(v.value())) {
            return "—";
        }
        String s = Format.sig(v.value());
        if (v.interval().isDefined()) {
            s += " (" + Format.sig(v.interval().low()) + "–" + Format.sig(v.interval().high()) + ")";
        }
        return s;
    }
}
