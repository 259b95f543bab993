package settle.reports.html.sections;

import java.util.List;
import settle.reports.html.Axis;
import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.html.Palette;
import settle.reports.html.SvgChart;
import settle.reports.metrics.ArmNudges;
import settle.reports.metrics.EpochBands;
import settle.reports.metrics.Replicates;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * "Training objective per epoch": per arm the median and interquartile band ({@link EpochBands}) of the training
 * objective at each epoch end (F(θ) − F(θ*) on a log scale for convex models), nudges and plateau cuts marked.
 */
final class ObjectiveSection implements Section {

    @Override
    public String id() {
        return "objective";
    }

    @Override
    public String navigation() {
        return "Training objective";
    }

    @Override
    public String heading() {
        return "Training objective per epoch";
    }

    @Override
    public void draw(Drawing d) {
        Study study = d.study();
        d.para(study.convex()
                ? "The full-batch training objective F(θ) at the end of each epoch, minus F(θ*) = "
                        + Format.sig(study.reference().objective()) + " (log scale): the median over each arm's "
                        + "finished replicates as a line, the interquartile range as a band."
                : "The full-batch training objective F(θ) at the end of each epoch: the median over each arm's "
                        + "finished replicates as a line, the interquartile range as a band.");
        List<List<ArmNudges.Mark>> nudges = ArmNudges.of(study);
        if (ArmNudges.count(nudges) > 0 || Replicates.anyCut(study)) {
            d.para("A dashed vertical marker is a nudge, drawn at the end of the epoch before it took effect (the last "
                    + "point at the old rate); a short tick is a plateau cut of one replicate, on its objective at the "
                    + "end of the epoch that triggered it.");
        }
        chart(d, nudges);
    }

    /**
     * The chart: each arm's band and median line (every epoch, or every k-th when an arm has more than
     * 3·{@value Drawing#MAX_BUCKETS} epochs), a tick per plateau cut of each replicate on its own objective at the end
     * of the epoch that triggered it, a marker per nudge at the end of the epoch before it, the legend, and a note on
     * medians off the axis.
     */
    private static void chart(Drawing d, List<List<ArmNudges.Mark>> nudges) {
        HtmlWriter w = d.writer();
        Study study = d.study();
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
        SvgChart c = new SvgChart(w, "chart-objective", "chart", Drawing.WIDE, 340, 70, Axis.fixed(1,
                Math.max(2, epochs), "epoch (1 = the first pass)"), y,
                "Training objective per epoch: median and interquartile band per arm");
        int hidden = 0;
        for (int a = 0; a < study.armCount(); a++) {
            int n = q[a].epochs();
            int stride = Math.max(1, (n + 3 * Drawing.MAX_BUCKETS - 1) / (3 * Drawing.MAX_BUCKETS));
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
                    c.tick(end, v, Palette.style(a), "cut", Drawing.cutTooltip(study.armName(a), r, k.fromEpoch(),
                            k.rate()));
                }
            }
        }
        d.nudgeMarkers(c, nudges, 1);
        c.end();
        d.legend(true);
        d.offAxisNote(hidden, "median point", y);
    }
}
