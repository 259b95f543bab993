package settle.reports.html;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import settle.reports.metrics.ArmNudges;
import settle.reports.metrics.DistanceCurves;
import settle.reports.metrics.EpochBands;
import settle.reports.metrics.Replicates;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.metrics.TailCloud;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.VerdictOptions;
import settle.reports.study.Metric;
import settle.reports.study.Replicate;
import settle.reports.study.Study;

/** The report's charts, each an inline SVG written through an {@link HtmlWriter}. */
final class Figures {

    /** Most points drawn per arm for a long series (rates of every update). */
    static final int MAX_BUCKETS = 200;
    private static final double WIDE = 880;

    private Figures() {
    }

    // ---------------------------------------------------------------- legend

    static void legend(HtmlWriter w, Study study, boolean lines) {
        w.open("ul", "class", "legend");
        for (int a = 0; a < study.armCount(); a++) {
            Palette.Style s = Palette.style(a);
            w.open("li");
            w.open("svg", "width", "34", "height", "14", "class", "swatch", "aria-hidden", "true");
            if (lines) {
                w.empty("line", "x1", "1", "x2", "33", "y1", "7", "y2", "7", "stroke", s.colour(), "stroke-width", "2",
                        "stroke-dasharray", s.dash());
            }
            SvgChart.marker(w, 17, 7, 4, s.shape(), s.colour(), true, "swatch-mark", null);
            w.close("svg");
            w.text(study.armName(a));
            w.close("li");
        }
        w.close("ul");
    }

    // ---------------------------------------------------------------- rates

    static void rates(HtmlWriter w, Study study) {
        int perEpoch = Math.max(1, study.manifest().updatesPerEpoch());
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        double xMax = 1;
        for (int a = 0; a < study.armCount(); a++) {
            for (Replicate r : Replicates.withOwnRates(study, a)) {
                for (double v : r.rates()) {
                    if (v > 0 && Double.isFinite(v)) {
                        lo = Math.min(lo, v);
                        hi = Math.max(hi, v);
                    }
                }
                xMax = Math.max(xMax, 1 + (double) Math.max(r.rates().length, r.totalUpdates()) / perEpoch);
            }
        }
        Axis y = Axis.log(lo, hi, "rate α");
        SvgChart c = new SvgChart(w, "chart-rates", "chart", WIDE, 340, 70, Axis.fixed(1, xMax, "epoch (epoch 1 = the "
                + "first pass; update u at 1 + (u − 1)/" + perEpoch + ")"), y,
                "Learning rate of every update, per arm, on a log scale");
        int hidden = 0;
        for (int a = 0; a < study.armCount(); a++) {
            boolean cut = Replicates.cut(study, a);
            for (Replicate r : Replicates.withOwnRates(study, a)) {
                double[][] xy = downsampleRates(r.rates(), perEpoch, MAX_BUCKETS);
                hidden += c.line(xy[0], xy[1], Palette.style(a), cut ? "series rate-replicate" : "series rate");
                if (cut) {
                    for (var k : r.plateauCuts()) {
                        c.tick(k.fromEpoch(), k.rate(), Palette.style(a), "cut",
                                Marks.cutTooltip(study.armName(a), r, k.fromEpoch(), k.rate()));
                    }
                }
            }
        }
        nudgeMarkers(c, study, 0);
        c.end();
        legend(w, study, true);
        offAxisNote(w, hidden, "rate", y);
    }

    /**
     * A note under a log chart whose axis could not hold every value (it spans at most {@value Axis#MAX_DECADES}
     * decades, keeping the largest): how many points are not drawn. Nothing when none.
     */
    static void offAxisNote(HtmlWriter w, int hidden, String what, Axis y) {
        if (hidden > 0) {
            w.element("p", hidden + " " + what + (hidden == 1 ? " lies" : "s lie") + " outside the drawn range ("
                    + Axis.format(y.min()) + " to " + Axis.format(y.max()) + ": a log axis spans at most "
                    + Axis.MAX_DECADES + " decades) and " + (hidden == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
    }

    /**
     * One vertical marker (class "nudge") per nudge of every arm, at epoch {@code from − shift}: the rate chart
     * marks the nudge's first update (shift 0); the objective chart the end of the epoch before it (shift 1, the
     * last point before the nudge took effect; epoch 1 for a nudge in force from the start).
     */
    private static void nudgeMarkers(SvgChart c, Study study, int shift) {
        java.util.Map<Integer, Integer> rows = new java.util.HashMap<>();
        List<List<ArmNudges.Mark>> nudges = ArmNudges.of(study);
        for (int a = 0; a < nudges.size(); a++) {
            for (ArmNudges.Mark n : nudges.get(a)) {
                int x = Math.max(1, n.fromEpoch() - shift);
                int row = rows.merge(x, 1, Integer::sum) - 1;
                c.vertical(x, Palette.style(a), "nudge", Marks.label(n), Marks.tooltip(n, study.armName(a)),
                        Math.min(row, 5));
            }
        }
    }

    /**
     * @return x (epoch position 1 + (u − 1)/U) and y of at most 3·buckets points keeping, per bucket, its
     *     first value and its extremes in order, so steps and restarts stay visible
     */
    static double[][] downsampleRates(double[] rates, int perEpoch, int buckets) {
        int n = rates.length;
        if (n <= 3 * buckets) {
            double[] x = new double[n];
            for (int u = 0; u < n; u++) {
                x[u] = 1 + (double) u / perEpoch;
            }
            return new double[][] {x, rates.clone()};
        }
        double[] xs = new double[3 * buckets + 1];
        double[] ys = new double[3 * buckets + 1];
        int k = 0;
        for (int b = 0; b < buckets; b++) {
            int from = (int) ((long) b * n / buckets);
            int to = (int) ((long) (b + 1) * n / buckets);
            int iMin = from;
            int iMax = from;
            for (int u = from; u < to; u++) {
                if (rates[u] < rates[iMin]) {
                    iMin = u;
                }
                if (rates[u] > rates[iMax]) {
                    iMax = u;
                }
            }
            int[] keep = {from, Math.min(iMin, iMax), Math.max(iMin, iMax)};
            int previous = -1;
            for (int u : keep) {
                if (u != previous) {
                    xs[k] = 1 + (double) u / perEpoch;
                    ys[k++] = rates[u];
                    previous = u;
                }
            }
        }
        xs[k] = 1 + (double) (n - 1) / perEpoch;
        ys[k++] = rates[n - 1];
        return new double[][] {Arrays.copyOf(xs, k), Arrays.copyOf(ys, k)};
    }

    // ---------------------------------------------------------------- objective

    static void objective(HtmlWriter w, Study study) {
        boolean convex = study.convex();
        double shift = convex ? study.reference().objective() : 0.0;
        EpochBands[] q = new EpochBands[study.armCount()];
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        int epochs = 1;
        for (int a = 0; a < study.armCount(); a++) {
            q[a] = EpochBands.of(study, a, r -> r.epochs().objective(), shift);
            epochs = Math.max(epochs, q[a].epochs());
            for (int e = 0; e < q[a].epochs(); e++) {
                for (double v : new double[] {q[a].lower()[e], q[a].median()[e], q[a].upper()[e]}) {
                    if (Double.isFinite(v) && (!convex || v > 0)) {
                        lo = Math.min(lo, v);
                        hi = Math.max(hi, v);
                    }
                }
            }
        }
        Axis y = convex ? Axis.log(lo, hi, "F(θ) − F(θ*) at the epoch's end") : Axis.linear(lo, hi,
                "training objective F(θ) at the epoch's end");
        SvgChart c = new SvgChart(w, "chart-objective", "chart", WIDE, 340, 70, Axis.fixed(1, Math.max(2, epochs),
                "epoch (1 = the first pass)"), y, "Training objective per epoch: median and interquartile band per arm");
        int hidden = 0;
        for (int a = 0; a < study.armCount(); a++) {
            int n = q[a].epochs();
            int stride = Math.max(1, (n + 3 * MAX_BUCKETS - 1) / (3 * MAX_BUCKETS));
            int m = (n + stride - 1) / stride;
            double[] xs = new double[m];
            double[] q1 = new double[m];
            double[] med = new double[m];
            double[] q3 = new double[m];
            for (int i = 0, e = 0; e < n; e += stride, i++) {
                xs[i] = e + 1;
                q1[i] = q[a].lower()[e];
                med[i] = q[a].median()[e];
                q3[i] = q[a].upper()[e];
            }
            c.band(xs, q1, q3, Palette.style(a), "band");
            hidden += c.line(xs, med, Palette.style(a), "series median");
        }
        // Plateau cuts: a tick per replicate per cut, on that replicate's objective at the end of the epoch whose
        // plateau triggered the cut (the epoch before the first one at the reduced rate).
        for (int a = 0; a < study.armCount(); a++) {
            for (Replicate r : study.replicates().get(a)) {
                if (r == null) {
                    continue;
                }
                double[] objective = r.epochs().objective();
                for (var k : r.plateauCuts()) {
                    int end = k.fromEpoch() - 1;
                    double v = end >= 1 && end <= objective.length ? objective[end - 1] - shift : Double.NaN;
                    c.tick(end, v, Palette.style(a), "cut", Marks.cutTooltip(study.armName(a), r, k.fromEpoch(),
                            k.rate()));
                }
            }
        }
        nudgeMarkers(c, study, 1);
        c.end();
        legend(w, study, true);
        offAxisNote(w, hidden, "median point", y);
    }

    // ---------------------------------------------------------------- distance

    /**
     * One small panel per arm on shared axes: the measured mean ‖θ − θ*‖² at each epoch end (arm colour) and the
     * predicted curve (dashed). The log axis is chosen from the measured values first and spans at most
     * {@value Axis#MAX_DECADES} decades; predicted points off it are not drawn, and a note says how many.
     */
    static void distance(HtmlWriter w, Study study) {
        int arms = study.armCount();
        DistanceCurves[] curves = new DistanceCurves[arms];
        double[] measured = {Double.POSITIVE_INFINITY, 0};
        double[] predicted = {Double.POSITIVE_INFINITY, 0};
        int epochs = 1;
        for (int a = 0; a < arms; a++) {
            curves[a] = DistanceCurves.of(study, a);
            epochs = Math.max(epochs, curves[a].epochs());
            extend(measured, curves[a].measured());
            extend(predicted, curves[a].predicted());
        }
        Axis y = Axis.log(measured[0], measured[1], predicted[0], predicted[1], "‖θ − θ*‖²");
        int hidden = 0;
        int hiddenMeasured = 0;
        w.open("div", "class", "multiples");
        Palette.Style predictedStyle = new Palette.Style("#333333", "5 3", Palette.Shape.CIRCLE);
        for (int a = 0; a < arms; a++) {
            w.open("figure", "class", "panel");
            SvgChart c = new SvgChart(w, "chart-distance-" + (a + 1), "chart small", 290, 220, 58,
                    Axis.fixed(1, Math.max(2, epochs), "epoch"), y,
                    "Distance to the reference minimiser per epoch for arm " + study.armName(a));
            double[] xs = new double[curves[a].epochs()];
            for (int e = 0; e < xs.length; e++) {
                xs[e] = e + 1;
            }
            // The measured curve first, the dashed prediction over it: where they agree both stay visible.
            hiddenMeasured += c.line(xs, curves[a].measured(), Palette.style(a), "series measured");
            hidden += c.line(xs, curves[a].predicted(), predictedStyle, "series predicted");
            c.end();
            int unstable = curves[a].unstableEpoch();
            String caption = study.armName(a);
            if (xs.length == 0) {
                caption += " (no finished replicate: nothing to draw)";
            } else if (unstable > 0) {
                caption += " (prediction unstable from epoch " + unstable + ": not drawn from there)";
            }
            w.element("figcaption", caption);
            w.close("figure");
        }
        w.close("div");
        w.open("ul", "class", "legend");
        w.open("li");
        w.open("svg", "width", "34", "height", "14", "class", "swatch", "aria-hidden", "true");
        w.empty("line", "x1", "1", "x2", "33", "y1", "7", "y2", "7", "stroke", "#555555", "stroke-width", "2");
        w.close("svg");
        w.text("measured: mean over the arm's finished replicates of ‖θ − θ*‖² at each epoch end (arm colour)");
        w.close("li");
        w.open("li");
        w.open("svg", "width", "34", "height", "14", "class", "swatch", "aria-hidden", "true");
        w.empty("line", "x1", "1", "x2", "33", "y1", "7", "y2", "7", "stroke", "#333333", "stroke-width", "2",
                "stroke-dasharray", "5 3");
        w.close("svg");
        w.text("predicted E‖θ − θ*‖² at each epoch end, averaged over the replicates' own rate sequences");
        w.close("li");
        w.close("ul");
        if (hidden + hiddenMeasured > 0) {
            String what = hiddenMeasured == 0 ? hidden + " predicted point" + (hidden == 1 ? " lies" : "s lie")
                    : hidden == 0 ? hiddenMeasured + " measured point" + (hiddenMeasured == 1 ? " lies" : "s lie")
                    : hiddenMeasured + " measured and " + hidden + " predicted points lie";
            w.element("p", what + " outside the drawn range (" + Axis.format(y.min()) + " to " + Axis.format(y.max())
                    + ": the axis spans at most " + Axis.MAX_DECADES + " decades, chosen from the measured values "
                    + "first) and " + (hidden + hiddenMeasured == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
    }

    /** Widens range {low, high} to the positive finite values of v. */
    private static void extend(double[] range, double[] v) {
        for (double x : v) {
            if (x > 0 && Double.isFinite(x)) {
                range[0] = Math.min(range[0], x);
                range[1] = Math.max(range[1], x);
            }
        }
    }

    // ---------------------------------------------------------------- strip plots

    /**
     * A horizontal strip plot: one row per arm, one mark (class "replicate") per replicate present, diverged
     * replicates as a distinct mark (class "replicate diverged") at the right edge, the median as a bar.
     */
    static void strip(HtmlWriter w, StudyAnalysis analysis, Metric metric, String id) {
        Study study = analysis.study();
        int arms = study.armCount();
        double floor = VerdictOptions.DEFAULT_FLOOR;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        boolean anyDiverged = false;
        int unmeasured = 0;
        int offAxis = 0;
        for (int a = 0; a < arms; a++) {
            for (Replicate r : study.replicates().get(a)) {
                if (r == null) {
                    continue;
                }
                if (r.diverged()) {
                    anyDiverged = true;
                    continue;
                }
                double v = Math.max(floor, r.metric(metric));
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                } else {
                    unmeasured++;
                }
            }
        }
        boolean log = lo > 0 && hi / lo > 20;
        String unit = switch (metric) {
            case TAIL_RADIUS, FINAL_DISTANCE, TAIL_DISTANCE -> " (parameter-space distance, the units of θ)";
            case FINAL_GAP, AVERAGED_GAP -> " (objective units, nats per example)";
            default -> "";
        };
        Axis x = log ? Axis.log(lo, hi, metric.words() + unit) : Axis.linear(Math.min(lo, hi), hi, metric.words() + unit);
        double row = 26;
        double left = 170;
        double height = 12 + 46 + row * arms;
        double extra = anyDiverged ? 60 : 0;
        SvgChart c = new SvgChart(w, id, "chart strip", WIDE + extra, height, left, x, Axis.fixed(0, arms, null),
                metric.words() + " of every replicate, one row per arm" + (anyDiverged ? "; diverged replicates at the"
                        + " right, marked ×" : ""));
        ArmSummary[] summaries = analysis.summaries(metric);
        for (int a = 0; a < arms; a++) {
            double cy = c.py(arms - a - 0.5);
            String name = study.armName(a);
            String shown = name.length() > 24 ? name.substring(0, 23) + "…" : name;
            w.open("text", "class", "row-label", "x", SvgChart.n(left - 8), "y", SvgChart.n(cy + 4), "text-anchor", "end");
            w.element("title", name);
            w.text(shown);
            w.close("text");
            if (a % 2 == 1) {
                w.empty("rect", "class", "row-shade", "x", SvgChart.n(c.plotLeft()), "y", SvgChart.n(cy - row / 2),
                        "width", SvgChart.n(c.plotRight() - c.plotLeft()), "height", SvgChart.n(row));
            }
            Palette.Style style = Palette.style(a);
            List<Replicate> reps = study.replicates().get(a);
            for (int k = 0; k < reps.size(); k++) {
                Replicate r = reps.get(k);
                if (r == null) {
                    continue;
                }
                double jitter = ((k * 0.6180339887498949) % 1.0 - 0.5) * row * 0.6;
                if (r.diverged()) {
                    double dx = c.plotRight() + 14 + (k % 4) * 10;
                    SvgChart.marker(w, dx, cy + jitter, 4, Palette.Shape.CROSS, Palette.DIVERGED, false,
                            "replicate diverged", name + ", replicate " + (k + 1) + ": diverged at update "
                                    + r.divergedAtUpdate());
                    continue;
                }
                double v = r.metric(metric);
                if (!Double.isFinite(v)) {
                    continue;
                }
                if (!x.contains(Math.max(floor, v))) {
                    offAxis++;
                    continue;
                }
                double px = c.px(Math.max(floor, v));
                SvgChart.marker(w, px, cy + jitter, 3.4, style.shape(), style.colour(), false, "replicate",
                        name + ", replicate " + (k + 1) + ": " + Format.sig(v));
            }
            if (summaries != null && Double.isFinite(summaries[a].median())
                    && x.contains(Math.max(floor, summaries[a].median()))) {
                double m = c.px(Math.max(floor, summaries[a].median()));
                w.empty("line", "class", "median", "x1", SvgChart.n(m), "x2", SvgChart.n(m), "y1",
                        SvgChart.n(cy - row * 0.42), "y2", SvgChart.n(cy + row * 0.42), "stroke", style.colour());
            }
        }
        if (anyDiverged) {
            w.element("text", "diverged", "class", "note", "x", SvgChart.n(c.plotRight() + 30), "y",
                    SvgChart.n(c.plotTop() - 2), "text-anchor", "middle");
        }
        c.end();
        if (offAxis > 0) {
            w.element("p", offAxis + " replicate" + (offAxis == 1 ? " lies" : "s lie") + " below the drawn range ("
                    + Axis.format(x.min()) + " to " + Axis.format(x.max()) + ": a log axis spans at most "
                    + Axis.MAX_DECADES + " decades) and " + (offAxis == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
        if (unmeasured > 0) {
            w.element("p", unmeasured + " finished replicate" + (unmeasured == 1 ? " has" : "s have") + " no finite "
                    + metric.words() + " and " + (unmeasured == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
    }

    // ---------------------------------------------------------------- tail cloud

    /** The tail cloud of a study whose {@link TailCloud#skipReason} is null: one panel per arm on shared axes. */
    static void cloud(HtmlWriter w, Study study) {
        int arms = study.armCount();
        TailCloud cloud = TailCloud.of(study);
        if (!cloud.available()) {
            w.element("p", "Not drawn: " + cloud.unavailable() + ".", "class", "note");
            return;
        }
        double xlo = Double.POSITIVE_INFINITY;
        double xhi = Double.NEGATIVE_INFINITY;
        double ylo = Double.POSITIVE_INFINITY;
        double yhi = Double.NEGATIVE_INFINITY;
        for (double[][] xy : cloud.points()) {
            for (double[] pt : xy) {
                xlo = Math.min(xlo, pt[0]);
                xhi = Math.max(xhi, pt[0]);
                ylo = Math.min(ylo, pt[1]);
                yhi = Math.max(yhi, pt[1]);
            }
        }
        double[] star = cloud.star();
        if (star != null) {
            xlo = Math.min(xlo, star[0]);
            xhi = Math.max(xhi, star[0]);
            ylo = Math.min(ylo, star[1]);
            yhi = Math.max(yhi, star[1]);
        }
        Axis x = Axis.linear(xlo, xhi, String.format(java.util.Locale.ROOT, "first principal axis (%.0f %% of variance)",
                cloud.firstShare()));
        Axis y = Axis.linear(ylo, yhi, String.format(java.util.Locale.ROOT, "second axis (%.0f %%)", cloud.secondShare()));
        w.open("div", "class", "multiples");
        for (int a = 0; a < arms; a++) {
            w.open("figure", "class", "panel");
            SvgChart c = new SvgChart(w, "chart-cloud-" + (a + 1), "chart small", 290, 240, 58, x, y,
                    "Tail snapshots of arm " + study.armName(a) + " projected on the principal axes of all arms' tail"
                            + " snapshots");
            Palette.Style s = Palette.style(a);
            for (double[] pt : cloud.points().get(a)) {
                double px = c.px(pt[0]);
                double py = c.py(pt[1]);
                w.empty("circle", "class", "snapshot", "cx", SvgChart.n(px), "cy", SvgChart.n(py), "r", "1.7", "fill",
                        s.colour());
            }
            if (star != null) {
                SvgChart.marker(w, c.px(star[0]), c.py(star[1]), 6, Palette.Shape.PLUS, "#000000", false, "theta-star",
                        "θ*, the reference minimiser");
            }
            c.end();
            w.element("figcaption", study.armName(a));
            w.close("figure");
        }
        w.close("div");
    }

    // ---------------------------------------------------------------- heatmap

    /**
     * A grid heatmap: cells (row value × column value) coloured by the median metric, value written in the
     * cell; missing combinations left blank.
     */
    static void heatmap(HtmlWriter w, String id, String title, String rowKey, List<String> rowValues, String columnKey,
            List<String> columnValues, double[][] cells) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double[] r : cells) {
            for (double v : r) {
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        boolean log = lo > 0 && hi / lo > 20;
        double cw = 92;
        double ch = 34;
        double left = 120;
        double top = 44;
        double width = left + cw * columnValues.size() + 20;
        double height = top + ch * rowValues.size() + 16;
        w.open("figure", "class", "panel heat");
        w.open("svg", "id", id, "class", "chart heatmap", "viewBox", "0 0 " + SvgChart.n(width) + " " + SvgChart.n(height),
                "width", SvgChart.n(width), "height", SvgChart.n(height), "role", "img");
        w.element("title", title);
        w.element("text", columnKey, "class", "axis-title", "x", SvgChart.n(left + cw * columnValues.size() / 2), "y", "14",
                "text-anchor", "middle");
        w.element("text", rowKey, "class", "axis-title", "x", SvgChart.n(left - 10), "y", SvgChart.n(top - 6),
                "text-anchor", "end");
        for (int j = 0; j < columnValues.size(); j++) {
            w.element("text", columnValues.get(j), "class", "tick", "x", SvgChart.n(left + cw * (j + 0.5)), "y",
                    SvgChart.n(top - 8), "text-anchor", "middle");
        }
        for (int i = 0; i < rowValues.size(); i++) {
            double y = top + ch * i;
            w.element("text", rowValues.get(i), "class", "tick", "x", SvgChart.n(left - 10), "y", SvgChart.n(y + ch / 2 + 4),
                    "text-anchor", "end");
            for (int j = 0; j < columnValues.size(); j++) {
                double v = cells[i][j];
                double x = left + cw * j;
                if (!Double.isFinite(v)) {
                    w.empty("rect", "class", "cell empty", "x", SvgChart.n(x), "y", SvgChart.n(y), "width",
                            SvgChart.n(cw - 2), "height", SvgChart.n(ch - 2));
                    continue;
                }
                double t = hi > lo ? (log ? Math.log(v / lo) / Math.log(hi / lo) : (v - lo) / (hi - lo)) : 0.5;
                w.open("rect", "class", "cell", "x", SvgChart.n(x), "y", SvgChart.n(y), "width", SvgChart.n(cw - 2),
                        "height", SvgChart.n(ch - 2), "fill", Palette.sequential(t));
                w.element("title", rowKey + " " + rowValues.get(i) + ", " + columnKey + " " + columnValues.get(j) + ": "
                        + Format.sig(v));
                w.close("rect");
                w.element("text", Format.sig(v), "class", Palette.darkCell(t) ? "cell-text light" : "cell-text", "x",
                        SvgChart.n(x + cw / 2 - 1), "y", SvgChart.n(y + ch / 2 + 3), "text-anchor", "middle");
            }
        }
        w.close("svg");
        w.element("figcaption", title + " (darker is smaller)");
        w.close("figure");
    }
}
