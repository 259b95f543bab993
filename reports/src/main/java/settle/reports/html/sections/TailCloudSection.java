package settle.reports.html.sections;

import java.util.Locale;
import settle.reports.html.Axis;
import settle.reports.html.HtmlWriter;
import settle.reports.html.Palette;
import settle.reports.html.SvgChart;
import settle.reports.metrics.TailCloud;
import settle.reports.format.Study;

/**
 * "Tail cloud of every arm": each arm's tail snapshots projected on the principal axes of all arms' snapshots pooled
 * ({@link TailCloud}), one panel per arm on shared axes, θ* marked; otherwise why it is not drawn.
 */
final class TailCloudSection implements Section {

    @Override
    public String id() {
        return "tail-cloud";
    }

    @Override
    public String navigation() {
        return "Tail cloud";
    }

    @Override
    public String heading() {
        return "Tail cloud of every arm";
    }

    @Override
    public void draw(Drawing d) {
        Study study = d.study();
        String reason = TailCloud.skipReason(study);
        if (reason != null) {
            d.para("Not drawn: " + reason + ".");
        } else {
            d.para("The tail snapshots of every arm projected onto the two principal axes of all arms' tail snapshots "
                    + "pooled (at most " + TailCloud.POINTS_PER_ARM + " per arm, evenly over its replicates); every "
                    + "panel shares the axes, so the clouds' sizes compare directly"
                    + (study.convex() ? "; + marks θ*." : "."));
            chart(d);
        }
    }

    /** The tail cloud of a study whose {@link TailCloud#skipReason} is null: one panel per arm on shared axes. */
    private static void chart(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
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
        Axis x = Axis.linear(xlo, xhi, String.format(Locale.ROOT, "first principal axis (%.0f %% of variance)",
                cloud.firstShare()));
        Axis y = Axis.linear(ylo, yhi, String.format(Locale.ROOT, "second axis (%.0f %%)", cloud.secondShare()));
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
}
