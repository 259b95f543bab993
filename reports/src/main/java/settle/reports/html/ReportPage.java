package settle.reports.html;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import settle.reports.metrics.ArmLevel;
import settle.reports.metrics.ArmNudges;
import settle.reports.metrics.ArmPick;
import settle.reports.metrics.BallDiagnosis;
import settle.reports.metrics.PlateauSummary;
import settle.reports.metrics.Ranks;
import settle.reports.metrics.RateSummary;
import settle.reports.metrics.Replicates;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.metrics.TailCloud;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Comparison;
import settle.reports.stats.Interval;
import settle.reports.stats.VerdictSentence;
import settle.reports.study.Manifest;
import settle.reports.study.Metric;
import settle.reports.study.Prediction;
import settle.reports.study.Replicate;
import settle.reports.study.Study;

/**
 * {@code report.html}: one self-contained page (inline CSS and SVG, no script, a Content-Security-Policy
 * that forbids every fetch) with the sections of {@link #SECTIONS}, each a {@code <section>} with that id.
 * Every string from the study (arm, feature and class names, the plan text, paths) is escaped.
 */
public final class ReportPage {

    /** Section ids, in page order. */
    public static final List<String> SECTIONS = List.of("verdict", "rates", "objective", "distance", "wander",
            "a-priori", "tail-cloud", "grid", "replicates", "provenance", "limits");

    /** The sections' titles in the page's navigation, in the order of {@link #SECTIONS}. */
    private static final List<String> TITLES = List.of("Verdict", "Rates", "Training objective", "Distance to θ*",
            "Wander per replicate", "A-priori bound", "Tail cloud", "Grid", "Replicates", "Provenance", "Limits");

    /** The Content-Security-Policy of the page: nothing may be fetched; inline style and data images only. */
    public static final String CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:";

    private static final Pattern STUDY = Pattern.compile("(?m)^study:\\s*\"?([^\"\\r\\n]*?)\"?\\s*$");
    private static final Pattern GRID_ARM = Pattern.compile("^(.*)\\[([^\\[\\]]+)\\]$");

    private final StudyAnalysis analysis;
    private final Study study;
    private final Manifest manifest;
    private final HtmlWriter w;
    private final List<String> failed = new ArrayList<>();

    /**
     * A rendered page.
     *
     * @param html the page
     * @param failedSections "id (what went wrong)" for each section that could not be drawn (and says so on the
     *     page); empty when every section was drawn
     */
    public record Rendered(String html, List<String> failedSections) {

        public Rendered {
            failedSections = List.copyOf(failedSections);
        }
    }

    private ReportPage(StudyAnalysis analysis) {
        this.analysis = analysis;
        this.study = analysis.study();
        this.manifest = study.manifest();
        this.w = new HtmlWriter(1 << 18);
    }

    /**
     * @param analysis the analysed study
     * @return the page
     */
    public static String render(StudyAnalysis analysis) {
        return renderPage(analysis).html();
    }

    /**
     * Renders every section; a section that fails (a fault in settle, not in the study) is replaced by one that
     * says so, so the rest of the report is still written.
     *
     * @param analysis the analysed study
     * @return the page and the sections that could not be drawn
     */
    public static Rendered renderPage(StudyAnalysis analysis) {
        ReportPage page = new ReportPage(analysis);
        page.page();
        return new Rendered(page.w.toString(), page.failed);
    }

    /** @return the study's name from the plan text, or the directory's name */
    static String studyName(Study study) {
        Matcher m = STUDY.matcher(study.planText());
        if (m.find() && !m.group(1).isBlank()) {
            return m.group(1).trim();
        }
        return String.valueOf(study.directory().toAbsolutePath().normalize().getFileName());
    }

    private void page() {
        String name = studyName(study);
        w.doctype().open("html", "lang", "en").newline();
        w.open("head").newline();
        w.empty("meta", "charset", "utf-8").newline();
        w.empty("meta", "http-equiv", "Content-Security-Policy", "content", CSP).newline();
        w.empty("meta", "name", "viewport", "content", "width=device-width, initial-scale=1").newline();
        w.element("title", "settle report: " + name).newline();
        w.styleSheet(Css.SHEET).newline();
        w.close("head").newline();
        w.open("body").newline();
        w.open("header");
        w.element("h1", "Study " + name + ": does decay shrink the noise ball?");
        w.open("p", "class", "lede");
        int epochs = Replicates.epochs(study);
        w.text(manifest.model() + " on " + manifest.dataSource() + " (" + manifest.trainRows() + " training rows, "
                + manifest.testRows() + " test rows); " + study.armCount() + " arms × " + study.replicateCount()
                + " seed-paired replicates; " + epochs + " epochs of " + manifest.updatesPerEpoch() + " updates. "
                + "Baseline arm: " + manifest.baseline() + ".");
        w.close("p");
        if (study.missing() > 0 || study.diverged() > 0) {
            w.open("p", "class", "warning");
            List<String> parts = new ArrayList<>();
            if (study.missing() > 0) {
                parts.add(study.missing() + " replicate" + (study.missing() == 1 ? " is" : "s are")
                        + " missing: this is a partial study (run it again to finish it); the verdict pairs the "
                        + analysis.pairedReplicates().length + " replicate indices present in every arm");
            }
            if (study.diverged() > 0) {
                parts.add(study.diverged() + " replicate" + (study.diverged() == 1 ? "" : "s")
                        + " diverged: they count as the worst value in the verdict and are left out of summaries");
            }
            w.text(String.join("; ", parts) + ".");
            w.close("p");
        }
        w.open("nav");
        w.open("ul");
        for (int i = 0; i < SECTIONS.size(); i++) {
            w.open("li").element("a", TITLES.get(i), "href", "#" + SECTIONS.get(i)).close("li");
        }
        w.close("ul");
        w.close("nav");
        w.close("header").newline();
        w.open("main").newline();
        Runnable[] sections = {this::verdict, this::rates, this::objective, this::distance, this::wander,
            this::apriori, this::cloud, this::grid, this::replicates, this::provenance, this::limits};
        for (int i = 0; i < sections.length; i++) {
            guarded(i, sections[i]);
        }
        w.close("main").newline();
        w.open("footer");
        w.text("Written by settle " + manifest.toolVersion() + " from the study directory; rebuild with "
                + "settle report " + study.directory() + ".");
        w.close("footer").newline();
        w.close("body").newline();
        w.close("html").newline();
    }

    /**
     * Writes section i; when it throws, drops what it wrote and writes in its place a section that says it could not
     * be drawn, and records it in {@link #failed}.
     */
    private void guarded(int i, Runnable section) {
        HtmlWriter.Mark mark = w.mark();
        try {
            section.run();
        } catch (RuntimeException e) {
            w.rollback(mark);
            section(SECTIONS.get(i), TITLES.get(i));
            w.element("p", "This section could not be drawn (" + e + "). That is a fault in settle, not in the study; "
                    + "the other sections stand.", "class", "warning");
            endSection();
            failed.add(SECTIONS.get(i) + " (" + e + ")");
        }
    }

    private void section(String id, String title) {
        w.open("section", "id", id).newline();
        w.element("h2", title);
    }

    private void endSection() {
        w.close("section").newline();
    }

    private void para(String text) {
        w.element("p", text);
    }

    // ---------------------------------------------------------------- verdict

    private void verdict() {
        section("verdict", "Verdict");
        int base = manifest.baselineIndex();
        String baseline = manifest.baseline();
        List<Comparison> primary = analysis.comparisons(StudyAnalysis.PRIMARY);
        if (study.armCount() == 1) {
            para("The plan has only the baseline arm " + baseline + ": there is nothing to compare it with.");
        } else if (primary.isEmpty()) {
            para("No replicate index is present in every arm, so no arm can be compared with the baseline.");
        } else {
            pick(base);
            w.element("h3", "Each arm against the baseline " + baseline);
            w.open("ul", "class", "sentences");
            for (int a = 0; a < study.armCount(); a++) {
                if (a == base) {
                    continue;
                }
                w.open("li");
                w.element("strong", study.armName(a));
                Comparison c = analysis.comparison(StudyAnalysis.PRIMARY, a);
                w.text(" " + VerdictSentence.render(c) + ".");
                List<String> more = new ArrayList<>();
                for (Metric m : StudyAnalysis.COMPARED) {
                    Comparison d = m == StudyAnalysis.PRIMARY ? null : analysis.comparison(m, a);
                    if (d != null) {
                        more.add(withMetric(m, VerdictSentence.render(d)));
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
            String power = "With " + m + " arm" + (m == 1 ? "" : "s") + " compared with the baseline (Holm across arms),"
                    + " the smallest adjusted p an exact signed-rank test can reach with n pairs is " + m + "·2/2ⁿ, so a"
                    + " verdict needs at least " + needed + " replicates; this study pairs " + n + ".";
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
        verdictTable(base);
        endSection();
    }

    private void pick(int base) {
        ArmPick pick = ArmPick.of(analysis);
        ArmSummary[] radius = analysis.summaries(StudyAnalysis.PRIMARY);
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
                            ? " (at least " + analysis.replicatesNeeded() + " are needed for a verdict at this number of arms)"
                            : "") + ".");
            w.close("p");
        } else {
            int best = pick.arm();
            Comparison c = analysis.comparison(StudyAnalysis.PRIMARY, best);
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
                Comparison d = analysis.comparison(m, best);
                ArmSummary[] s = analysis.summaries(m);
                if (d == null || s == null) {
                    continue;
                }
                costs.add(withMetric(m, VerdictSentence.render(d)) + " (median " + Format.sig(s[best].median())
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

    private void verdictTable(int base) {
        w.open("div", "class", "scroll");
        w.open("table", "class", "verdict-table");
        w.open("caption").text("Per arm: medians over finished replicates [interquartile range]; changes against the "
                + "baseline paired by seed; arm-level spreads with joint bootstrap 95 % intervals.").close("caption");
        w.open("thead").open("tr");
        String[] heads = {"arm", "tail radius", "change", "exact 95 % CI", "bootstrap 95 % CI", "adjusted p (p)",
            "P(beats baseline)", "final gap", "test loss", "test accuracy", "seed spread", "prediction spread",
            "disagreement"};
        for (String h : heads) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead");
        w.open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            w.open("tr", "class", a == base ? "baseline" : null);
            w.open("th", "scope", "row", "class", "arm");
            swatch(a);
            w.text(study.armName(a) + (a == base ? " (baseline)" : ""));
            w.close("th");
            w.element("td", summaryCell(StudyAnalysis.PRIMARY, a), "class", "num");
            Comparison c = analysis.comparison(StudyAnalysis.PRIMARY, a);
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
            w.element("td", summaryCell(Metric.FINAL_GAP, a), "class", "num");
            w.element("td", summaryCell(Metric.TEST_LOSS, a), "class", "num");
            w.element("td", summaryCell(Metric.TEST_ACCURACY, a), "class", "num");
            w.element("td", levelCell(analysis.seedSpread(a)), "class", "num");
            w.element("td", levelCell(analysis.predictionSpread(a)), "class", "num");
            w.element("td", levelCell(analysis.disagreement(a)), "class", "num");
            w.close("tr");
        }
        w.close("tbody");
        w.close("table");
        w.close("div");
    }

    private void swatch(int a) {
        Palette.Style s = Palette.style(a);
        w.open("svg", "width", "14", "height", "14", "class", "swatch", "aria-hidden", "true");
        SvgChart.marker(w, 7, 7, 4, s.shape(), s.colour(), true, "swatch-mark", null);
        w.close("svg");
    }

    private static String range(Interval i) {
        return i.isDefined() ? Format.percentRange(Comparison.percent(i.low()), Comparison.percent(i.high())) : "—";
    }

    private String summaryCell(Metric m, int a) {
        ArmSummary[] s = analysis.summaries(m);
        if (s == null) {
            return "—";
        }
        ArmSummary x = s[a];
        return Format.sig(x.median()) + " [" + Format.sig(x.interquartileRange()) + "]";
    }

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

    // ---------------------------------------------------------------- rates

    private void rates() {
        section("rates", "Learning rate of every arm");
        para("Counter convention: epoch 1 is the first pass over the training data and update 1 the first update; "
                + "the rate of update u is drawn at epoch 1 + (u − 1)/U with U = " + manifest.updatesPerEpoch()
                + " updates per epoch. A schedule read per epoch shows its epoch-1 value from the start, not its "
                + "rate parameter: reciprocal decay α0/(1 + k·n) starts at α0/(1 + k). Replicate 1's rates are "
                + "drawn (every replicate has the same unless the schedule reads losses, as plateau does: an arm whose "
                + "rate a plateau schedule cut is drawn replicate by replicate, thin, with a tick where each "
                + "replicate's rate was cut). A dashed vertical marker is a nudge: the arm's rates multiplied by the "
                + "factor shown from that epoch on (hover for its note).");
        Figures.rates(w, study);
        w.open("table", "class", "compact");
        w.open("thead").open("tr");
        for (String h : new String[] {"arm", "first rate", "last rate", "Σα", "Σα²", "updates"}) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead").open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            RateSummary rates = RateSummary.of(study, a);
            w.open("tr");
            w.open("th", "scope", "row");
            swatch(a);
            w.text(study.armName(a));
            w.close("th");
            w.element("td", rates.updates() == 0 ? "—" : Format.sig(rates.first()), "class", "num");
            w.element("td", rates.updates() == 0 ? "—" : Format.sig(rates.last()), "class", "num");
            w.element("td", Format.sig(rates.sum()), "class", "num");
            w.element("td", Format.sig(rates.sumOfSquares()), "class", "num");
            w.element("td", Integer.toString(rates.updates()), "class", "num");
            w.close("tr");
        }
        w.close("tbody").close("table");
        nudgeTable();
        plateauTable();
        endSection();
    }

    /** The nudges of every arm, in arm order and then the order applied; nothing when there is none. */
    private void nudgeTable() {
        List<List<ArmNudges.Mark>> nudges = ArmNudges.of(study);
        int count = ArmNudges.count(nudges);
        if (count == 0) {
            return;
        }
        w.element("h3", "Nudges");
        para(count + " nudge" + (count == 1 ? "" : "s") + ": from its epoch on, every replicate of the arm ran at its "
                + "base schedule's rates times the product of the factors in force. The resulting rate is the one at "
                + "the first update of that epoch; a nudge without a time was fixed in the plan.");
        w.open("table", "class", "compact", "id", "nudges");
        w.open("thead").open("tr");
        for (String h : new String[] {"arm", "from epoch", "factor", "resulting rate", "note", "time"}) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead").open("tbody");
        for (int a = 0; a < nudges.size(); a++) {
            for (ArmNudges.Mark n : nudges.get(a)) {
                w.open("tr", "class", "nudge-row");
                w.open("th", "scope", "row");
                swatch(a);
                w.text(study.armName(a));
                w.close("th");
                w.element("td", Integer.toString(n.fromEpoch()), "class", "num");
                w.element("td", Format.sig(n.factor()), "class", "num");
                w.element("td", Format.sig(n.rate()), "class", "num");
                w.element("td", n.note().isEmpty() ? "—" : n.note());
                w.element("td", n.time().isEmpty() ? "in the plan" : n.time());
                w.close("tr");
            }
        }
        w.close("tbody").close("table");
    }

    /**
     * Per arm whose rate a plateau schedule cut: the median number of cuts over its replicates and the epochs of
     * their first cuts; nothing when no rate was cut.
     */
    private void plateauTable() {
        List<Integer> arms = new ArrayList<>();
        for (int a = 0; a < study.armCount(); a++) {
            if (Replicates.cut(study, a)) {
                arms.add(a);
            }
        }
        if (arms.isEmpty()) {
            return;
        }
        w.element("h3", "Plateau cuts");
        para("Where a plateau schedule cut the rate, per replicate (the first epoch at each reduced rate): the number of "
                + "cuts over the arm's replicates (type-7 median) and the epoch of each replicate's first cut.");
        w.open("table", "class", "compact", "id", "plateau-cuts");
        w.open("thead").open("tr");
        for (String h : new String[] {"arm", "replicates", "median cuts", "cuts (min–max)",
            "first cut: median epoch", "first cut: epochs (min–max)", "never cut"}) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead").open("tbody");
        for (int a : arms) {
            PlateauSummary cuts = PlateauSummary.of(study, a);
            double[] c = cuts.cuts();
            double[] f = cuts.firstCuts();
            w.open("tr");
            w.open("th", "scope", "row");
            swatch(a);
            w.text(study.armName(a));
            w.close("th");
            w.element("td", Integer.toString(cuts.replicates()), "class", "num");
            w.element("td", Format.sig(cuts.medianCuts()), "class", "num");
            w.element("td", Format.sig(c[0]) + "–" + Format.sig(c[c.length - 1]), "class", "num");
            w.element("td", f.length == 0 ? "—" : Format.sig(cuts.medianFirstCut()), "class", "num");
            w.element("td", f.length == 0 ? "—" : Format.sig(f[0]) + "–" + Format.sig(f[f.length - 1]), "class", "num");
            w.element("td", Integer.toString(cuts.neverCut()), "class", "num");
            w.close("tr");
        }
        w.close("tbody").close("table");
    }

    // ---------------------------------------------------------------- objective, distance

    private void objective() {
        section("objective", "Training objective per epoch");
        para(study.convex()
                ? "The full-batch training objective F(θ) at the end of each epoch, minus F(θ*) = "
                        + Format.sig(study.reference().objective()) + " (log scale): the median over each arm's finished "
                        + "replicates as a line, the interquartile range as a band."
                : "The full-batch training objective F(θ) at the end of each epoch: the median over each arm's finished "
                        + "replicates as a line, the interquartile range as a band.");
        if (ArmNudges.count(ArmNudges.of(study)) > 0 || Replicates.anyCut(study)) {
            para("A dashed vertical marker is a nudge, drawn at the end of the epoch before it took effect (the last "
                    + "point at the old rate); a short tick is a plateau cut of one replicate, on its objective at the "
                    + "end of the epoch that triggered it.");
        }
        Figures.objective(w, study);
        endSection();
    }

    /**
     * The distance section: what the prediction is, the chart of measured and predicted ‖θ − θ*‖² per epoch end,
     * and per arm the measured against the predicted mean over every tail update and over the tail's epoch ends,
     * with the arm's {@link BallDiagnosis}: a ratio is printed only when the diagnosis says it tests the theory.
     */
    private void distance() {
        section("distance", "Distance to θ*: measured and predicted");
        if (!study.convex()) {
            para("Not available: the model is not convex, so there is no reference minimiser θ* to measure against.");
            endSection();
            return;
        }
        Replicates.Predictions predictions = Replicates.predictions(study);
        Prediction label = predictions.example();
        String skipped = predictions.skipped();
        boolean replacement = label != null && label.sampling().equals("replacement");
        para("Squared distances to θ* are compared: measured, the mean over an arm's finished replicates of ‖θ_t − θ*‖²; "
                + "predicted, the mean of the replicates' predicted E‖θ_t − θ*‖² from the mean and covariance recursion "
                + "linearised at θ*, run on each replicate's own rates. The prediction is set against the distance to "
                + "θ*, not against the tail radius: a short tail sees only part of the stationary spread.");
        para(replacement
                ? "This study samples with replacement: every batch is an independent draw, the epoch ends are not "
                        + "special, and the two rows of each arm below should agree."
                : "Under shuffle a run pulses within each epoch: the batches of an epoch partition the training rows, "
                        + "so their noise largely cancels over the epoch, and the distance at epoch ends differs from "
                        + "its mean over all updates (usually smaller; a short last batch or a large rate can make it "
                        + "larger). Hence two rows per arm below: over every update of the tail, and over the tail's "
                        + "epoch ends only.");
        if (label != null) {
            w.open("p", "class", "note");
            w.element("strong", "What the prediction is: ");
            w.text(label.label());
            w.close("p");
        }
        if (skipped != null) {
            w.open("p", "class", "note");
            w.element("strong", label == null ? "Prediction skipped: " : "Prediction skipped for some replicates: ");
            w.text(skipped);
            w.close("p");
        }
        Figures.distance(w, study);
        w.element("h3", "Has each arm reached its ball?");
        para("A ratio of measured to predicted tests the theory only where the arm has reached its noise ball. The "
                + "prediction splits E‖θ_t − θ*‖² into bias², the squared mean offset still left from the start, and "
                + "the ball, the spread around that mean, both at the last update and averaged over the tail. The "
                + "first rule that holds decides:");
        w.open("ol", "class", "rules");
        w.element("li", "unstable: some update's α·λmax reaches 2(1 + β)" + bound(label) + "; no ratio, and no "
                + "predicted curve from there;");
        w.element("li", "has not reached its ball: bias² ≥ ball at the last update; no ratio;");
        w.element("li", "farther than the theory allows: the measured ‖θ_T − θ*‖² exceeds "
                + Format.sig(BallDiagnosis.FARTHER_FACTOR) + "× the prediction at the last update; no ratio;");
        w.element("li", "still approaching its ball: bias² is at least " + Math.round(100 * BallDiagnosis.LOOSE_FROM)
                + " % of the ball, at the last update or over the tail; the ratio is a loose test;");
        w.element("li", "otherwise it has reached its ball, and the ratio tests the theory.");
        w.close("ol");
        w.open("div", "class", "scroll");
        w.open("table", "class", "compact ball-table", "id", "ball-table");
        w.open("thead").open("tr");
        for (String h : new String[] {"arm", "over", "measured mean ‖θ − θ*‖²", "predicted", "measured / predicted",
            "predicted bias² / ball", "largest α·λmax"}) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead");
        for (int a = 0; a < study.armCount(); a++) {
            BallDiagnosis d = BallDiagnosis.of(study, a);
            Replicate.Tail tail = Replicates.firstTail(study, a);
            w.open("tbody", "class", "arm-ball", "data-state", d.state().name().toLowerCase(java.util.Locale.ROOT)
                    .replace('_', '-'));
            w.open("tr");
            w.open("th", "scope", "rowgroup", "rowspan", "3", "class", "arm");
            swatch(a);
            w.text(study.armName(a));
            w.close("th");
            w.element("td", "every tail update" + (tail == null ? "" : " (L = " + tail.length() + ")"), "class", "over");
            w.element("td", Format.sig(d.measuredTail()), "class", "num");
            w.element("td", Format.sig(shownPrediction(d, d.predictedTail())), "class", "num");
            w.element("td", Format.sig(d.tailRatio()), "class", "num ratio");
            if (d.state() == BallDiagnosis.State.UNSTABLE || Double.isNaN(d.biasSq() + d.ball())) {
                w.element("td", "—", "class", "num", "rowspan", "2");
            } else {
                w.open("td", "class", "num", "rowspan", "2");
                w.text("tail: " + Format.sig(d.tailBiasSq()) + " / " + Format.sig(d.tailBall()));
                w.empty("br");
                w.text("last update: " + Format.sig(d.biasSq()) + " / " + Format.sig(d.ball()));
                w.close("td");
            }
            w.element("td", Format.sig(d.largestProduct()), "class", "num", "rowspan", "2");
            w.close("tr");
            w.open("tr");
            w.element("td", tail == null || tail.epochEnds() < 0 ? "the tail's epoch ends"
                    : "the tail's " + tail.epochEnds() + " epoch end" + (tail.epochEnds() == 1 ? "" : "s"), "class",
                    "over");
            w.element("td", Format.sig(d.measuredEpochEnds()), "class", "num");
            w.element("td", Format.sig(shownPrediction(d, d.predictedEpochEnds())), "class", "num");
            w.element("td", Format.sig(d.epochEndsRatio()), "class", "num ratio");
            w.close("tr");
            w.open("tr", "class", "diagnosis");
            w.open("td", "colspan", "6");
            if (!d.ratioShown()) {
                w.element("strong", "No ratio: ");
            }
            w.text(capitalised(d.sentence()) + ".");
            w.close("td");
            w.close("tr");
            w.close("tbody");
        }
        w.close("table");
        w.close("div");
        para("Measured over every tail update: the mean of tail distance² = (1/L) Σ ‖θ_t − θ*‖² over the tail's L "
                + "updates; over the epoch ends: the same over the tail's epoch ends (L and the number of epoch ends "
                + "are those of the arm's first finished replicate). Bias² and ball are means over the "
                + "replicates' predictions, averaged over the tail's updates and at the last update; "
                + "largest α·λmax is the largest over the run and the replicates.");
        endSection();
    }

    /** @return the predicted value shown: none for an unstable arm */
    private static double shownPrediction(BallDiagnosis d, double value) {
        return d.state() == BallDiagnosis.State.UNSTABLE ? Double.NaN : value;
    }

    /** @return " (in rate units, 2(1 + β)/λmax = x)" from a prediction, or "" */
    private static String bound(Prediction p) {
        if (p == null || !Double.isFinite(p.stabilityBound())) {
            return "";
        }
        return ", that is when its rate reaches the stability bound 2(1 + β)/λmax = " + Format.sig(p.stabilityBound())
                + (p.momentum() == 0 ? "" : " (β = " + Format.sig(p.momentum()) + ")");
    }

    private static String capitalised(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }

    // ---------------------------------------------------------------- wander

    private void wander() {
        section("wander", "Wander of every replicate");
        para("Each mark is one replicate (hover for its number and value); the bar is the arm's median. Tail radius: "
                + "sqrt((1/L) Σ ‖θ_t − θ̄‖²) over every one of the L tail updates, θ̄ their mean: how much the run "
                + "still moves"
                + (study.convex() ? ". Final gap: F(θ_F) − F(θ*), θ_F the last iterate (the tail average for "
                        + "averaged arms); values below 1e-12 are drawn at 1e-12." : ".")
                + " Diverged replicates are drawn as red × marks right of the plot.");
        w.element("h3", "Tail radius (the primary metric)");
        Figures.strip(w, analysis, Metric.TAIL_RADIUS, "strip-tail-radius");
        if (analysis.available().contains(Metric.FINAL_GAP)) {
            w.element("h3", "Final gap");
            Figures.strip(w, analysis, Metric.FINAL_GAP, "strip-final-gap");
        } else {
            para("Final gap: not available (no reference minimiser).");
        }
        Figures.legend(w, study, false);
        endSection();
    }

    // ---------------------------------------------------------------- a-priori bound

    private void apriori() {
        section("a-priori", "A-priori ranking by a convex bound");
        if (!study.convex()) {
            para("Not shown: the last-iterate bound holds for convex objectives, and " + manifest.model()
                    + " is not convex (the study has no reference minimiser θ*).");
            endSection();
            return;
        }
        settle.reports.study.Bound bound = study.reference().bound();
        if (bound == null) {
            para("Not shown: this study's reference.json does not record the last-iterate bound (it was written by an "
                    + "earlier settle); settle check " + study.directory().resolve("plan.yaml") + " prints it.");
            endSection();
            return;
        }
        if (!bound.computed()) {
            para("Not shown: " + bound.skipped() + ".");
            endSection();
            return;
        }
        if (bound.values().length != study.armCount()) {
            para("Not shown: reference.json records the bound for " + bound.values().length + " arms; the study has "
                    + study.armCount() + ".");
            endSection();
            return;
        }
        w.open("p");
        w.element("strong", "A worst-case bound, not a prediction. ");
        w.text("Each arm's value of the convex last-iterate bound on E[F(θ_T)] − F(θ*) for its planned rates η_1 … η_T "
                + "(plateau arms without their cuts, nudged arms before their nudges): (D² + G² Σ η_t²) / (2 Σ η_t) + "
                + "(G²/2) Σ_{k<T} η_k / (Σ_{t>k} η_t) · (Σ_{t≥k} η_t²) / (Σ_{t≥k} η_t), with D = ‖θ₀ − θ*‖ = "
                + Format.sig(bound.d()) + " (replicate 1's start) and G = " + Format.sig(bound.g())
                + " (the root-mean-square norm of a batch gradient at θ₀). It holds for non-smooth convex problems "
                + "with bounded gradients and ranks schedules before any run; it does not say what the loss will be. "
                + "Source: " + (bound.source().isEmpty() ? "Defazio et al. 2023, arXiv:2310.07831, Theorem 10; "
                        + "Schaipp et al., ICML 2025, Theorem 1" : bound.source()) + ".");
        w.close("p");
        double[] radius = analysis.medians(Metric.TAIL_RADIUS);
        double[] gap = analysis.medians(Metric.FINAL_GAP);
        int[] byBound = Ranks.of(bound.values());
        int[] byRadius = Ranks.of(radius);
        int[] byGap = Ranks.of(gap);
        para("Ranks run from 1 (smallest) and ties share a rank. The empirical ranks are by the median over each arm's "
                + "finished replicates; an arm whose replicates all diverged has none.");
        w.open("div", "class", "scroll");
        w.open("table", "class", "compact", "id", "bound-ranking");
        w.open("thead").open("tr");
        for (String h : new String[] {"arm", "bound on E[F(θ_T)] − F(θ*) (worst case)", "rank by bound",
            "median tail radius", "rank", "median final gap", "rank"}) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead").open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            w.open("tr");
            w.open("th", "scope", "row");
            swatch(a);
            w.text(study.armName(a));
            w.close("th");
            w.element("td", Format.sig(bound.values()[a]), "class", "num");
            w.element("td", rank(byBound[a]), "class", "num");
            w.element("td", Format.sig(radius[a]), "class", "num");
            w.element("td", rank(byRadius[a]), "class", "num");
            w.element("td", Format.sig(gap[a]), "class", "num");
            w.element("td", rank(byGap[a]), "class", "num");
            w.close("tr");
        }
        w.close("tbody").close("table");
        w.close("div");
        endSection();
    }

    private static String rank(int r) {
        return r == 0 ? "—" : Integer.toString(r);
    }

    private void cloud() {
        section("tail-cloud", "Tail cloud of every arm");
        String reason = TailCloud.skipReason(study);
        if (reason != null) {
            para("Not drawn: " + reason + ".");
        } else {
            para("The tail snapshots of every arm projected onto the two principal axes of all arms' tail snapshots "
                    + "pooled (at most " + TailCloud.POINTS_PER_ARM + " per arm, evenly over its replicates); every "
                    + "panel shares the axes, so the clouds' sizes compare directly"
                    + (study.convex() ? "; + marks θ*." : "."));
            Figures.cloud(w, study);
        }
        endSection();
    }

    // ---------------------------------------------------------------- grid

    /** A grid arm name {@code base[key=value,key=value]} parsed, or null. */
    record GridName(String base, Map<String, String> values) {
        static GridName parse(String name) {
            Matcher m = GRID_ARM.matcher(name);
            if (!m.matches()) {
                return null;
            }
            Map<String, String> values = new LinkedHashMap<>();
            for (String part : m.group(2).split(",")) {
                int eq = part.indexOf('=');
                if (eq <= 0) {
                    return null;
                }
                values.put(part.substring(0, eq).trim(), part.substring(eq + 1).trim());
            }
            return new GridName(m.group(1), values);
        }
    }

    private void grid() {
        section("grid", "Grid");
        Map<String, List<Integer>> groups = new LinkedHashMap<>();
        Map<Integer, GridName> parsed = new LinkedHashMap<>();
        for (int a = 0; a < study.armCount(); a++) {
            GridName g = GridName.parse(study.armName(a));
            if (g != null) {
                parsed.put(a, g);
                groups.computeIfAbsent(g.base() + "\u0000" + String.join("\u0000", g.values().keySet()),
                        k -> new ArrayList<>()).add(a);
            }
        }
        boolean drawn = false;
        int figure = 0;
        for (List<Integer> members : groups.values()) {
            if (members.size() < 2) {
                continue;
            }
            GridName first = parsed.get(members.get(0));
            List<String> keys = new ArrayList<>(first.values().keySet());
            if (keys.size() > 2) {
                para("Arm " + first.base() + " is expanded over " + keys.size() + " keys (" + String.join(", ", keys)
                        + "): heatmaps are drawn for grids of one or two keys; see the verdict table.");
                continue;
            }
            String rowKey = keys.get(0);
            String columnKey = keys.size() == 2 ? keys.get(1) : "";
            List<String> rows = new ArrayList<>();
            List<String> columns = new ArrayList<>();
            for (int a : members) {
                GridName g = parsed.get(a);
                String r = g.values().get(rowKey);
                String c = keys.size() == 2 ? g.values().get(columnKey) : "";
                if (!rows.contains(r)) {
                    rows.add(r);
                }
                if (!columns.contains(c)) {
                    columns.add(c);
                }
            }
            w.element("h3", "Arm " + first.base() + " over " + String.join(" × ", keys));
            w.open("div", "class", "multiples");
            for (Metric m : List.of(Metric.TAIL_RADIUS, Metric.FINAL_GAP, Metric.TEST_LOSS, Metric.TEST_ACCURACY)) {
                ArmSummary[] s = analysis.summaries(m);
                if (s == null) {
                    continue;
                }
                double[][] cells = new double[rows.size()][columns.size()];
                for (double[] row : cells) {
                    java.util.Arrays.fill(row, Double.NaN);
                }
                for (int a : members) {
                    GridName g = parsed.get(a);
                    int i = rows.indexOf(g.values().get(rowKey));
                    int j = columns.indexOf(keys.size() == 2 ? g.values().get(columnKey) : "");
                    cells[i][j] = s[a].median();
                }
                figure++;
                Figures.heatmap(w, "heatmap-" + figure, "median " + m.words(), rowKey, rows, columnKey, columns, cells);
            }
            w.close("div");
            drawn = true;
        }
        if (!drawn) {
            para("The plan has no grid: no arm was expanded over hyperparameters (grid arms are named like "
                    + "reciprocal[rate=0.1,decay=0.3]).");
        }
        endSection();
    }

    // ---------------------------------------------------------------- replicates

    private void replicates() {
        section("replicates", "Every replicate");
        para("Replicate k of every arm shares its seeds (initial weights and mini-batch order). "
                + "Values at the final iterate (the tail average for averaged arms).");
        List<Metric> columns = analysis.available();
        w.open("div", "class", "scroll tall");
        w.open("table", "class", "replicate-table");
        w.open("thead").open("tr");
        w.element("th", "arm", "scope", "col");
        w.element("th", "replicate", "scope", "col");
        w.element("th", "status", "scope", "col");
        for (Metric m : columns) {
            w.element("th", m.words(), "scope", "col");
        }
        w.close("tr").close("thead").open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            for (int k = 0; k < study.replicateCount(); k++) {
                Replicate r = study.replicate(a, k);
                w.open("tr", "class", r == null ? "missing" : r.diverged() ? "diverged" : null);
                w.element("td", study.armName(a));
                w.element("td", Integer.toString(k + 1), "class", "num");
                w.element("td", r == null ? "missing" : r.diverged() ? "diverged at update " + r.divergedAtUpdate()
                        : r.status());
                for (Metric m : columns) {
                    w.element("td", r == null || r.diverged() ? "—" : Format.sig(r.metric(m)), "class", "num");
                }
                w.close("tr");
            }
        }
        w.close("tbody").close("table");
        w.close("div");
        endSection();
    }

    // ---------------------------------------------------------------- provenance, limits

    private void provenance() {
        section("provenance", "Provenance");
        String dir = study.directory().toString();
        w.open("p");
        w.text("Reproduce this study (the plan below is the resolved plan, every default filled in): ");
        w.element("code", "settle run " + study.directory().resolve("plan.yaml") + " --out " + dir);
        w.text("; rebuild this report: ");
        w.element("code", "settle report " + dir);
        w.text(".");
        w.close("p");
        w.open("dl", "class", "facts");
        fact("tool", "settle " + manifest.toolVersion() + (manifest.gitCommit().isEmpty() ? ""
                : ", commit " + manifest.gitCommit()));
        fact("command recorded", String.join(" ", manifest.command()));
        fact("JVM", manifest.jvm());
        fact("CPU", manifest.cpu());
        fact("executor", manifest.executor() + " (" + manifest.threads() + " threads)");
        fact("started – ended", manifest.started() + " – " + (manifest.ended().isEmpty() ? "(not ended)" : manifest.ended()));
        fact("random generator", manifest.generator() + ", root seed " + manifest.rootSeed());
        fact("plan SHA-256", manifest.planSha256());
        fact("data SHA-256", manifest.dataSha256());
        fact("split SHA-256", manifest.splitSha256());
        fact("data", manifest.dataSource() + ": " + manifest.rows() + " rows, " + manifest.trainRows() + " training, "
                + manifest.testRows() + " test");
        fact("features", String.join(", ", manifest.featureNames()));
        fact("classes", String.join(", ", manifest.classNames()));
        fact("model", manifest.model() + ", " + manifest.parameters() + " parameters");
        if (study.convex()) {
            fact("reference minimiser", study.reference().method() + ": F(θ*) = " + Format.sig(study.reference().objective())
                    + ", gradient norm " + Format.sig(study.reference().gradientNorm())
                    + (Double.isFinite(study.reference().stabilityBound()) ? ", stability bound 2/λmax = "
                            + Format.sig(study.reference().stabilityBound()) : ""));
        }
        w.close("dl");
        w.element("h3", "Seeds of each replicate (shared by every arm)");
        w.open("div", "class", "scroll");
        w.open("table", "class", "compact");
        w.open("thead").open("tr");
        for (String h : new String[] {"replicate", "initialisation seed", "sampling seed"}) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead").open("tbody");
        for (int k = 0; k < study.replicateCount(); k++) {
            Replicate r = Replicates.firstOfIndex(study, k);
            w.open("tr");
            w.element("td", Integer.toString(k + 1), "class", "num");
            w.element("td", r == null ? "—" : Long.toString(r.initialisationSeed()), "class", "num");
            w.element("td", r == null ? "—" : Long.toString(r.samplingSeed()), "class", "num");
            w.close("tr");
        }
        w.close("tbody").close("table");
        w.close("div");
        w.element("h3", "The plan (plan.yaml)");
        w.element("pre", study.planText(), "class", "plan");
        endSection();
    }

    private void fact(String term, String value) {
        w.element("dt", term);
        w.element("dd", value);
    }

    private void limits() {
        section("limits", "Limits of this result");
        w.open("ul");
        w.element("li", "It holds for this dataset (" + manifest.dataSource() + "), this model (" + manifest.model()
                + "), this batch size, number of epochs and sampling, and these arms only: another dataset, model or "
                + "budget can rank the schedules differently.");
        w.element("li", "It rests on " + study.replicateCount() + " replicates per arm. Few replicates give weak "
                + "verdicts: with " + analysis.comparedArms() + " arm(s) compared, at least "
                + analysis.replicatesNeeded() + " are needed before any difference can be declared, and \"no "
                + "difference detected\" is never evidence of no difference.");
        w.element("li", "The tail radius measures the wander inside the last tail of each run, over every tail update; "
                + "a short tail under a small rate sees only part of the stationary noise ball, and a rate that ends "
                + "near zero makes it small wherever the run froze.");
        w.element("li", "The predicted noise ball linearises SGD at θ*: exact for a quadratic objective (reshuffled "
                + "batches and momentum included), first-order for logistic regression, whose curvature varies over "
                + "the ball. Measured against predicted tests the theory only for an arm that has reached its ball; "
                + "the distance section says which did.");
        w.element("li", "Test metrics are measured on one test split of " + manifest.testRows() + " rows.");
        w.close("ul");
        endSection();
    }
}
