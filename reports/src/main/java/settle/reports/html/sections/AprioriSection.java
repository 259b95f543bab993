package settle.reports.html.sections;

import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.metrics.Ranks;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.format.Bound;
import settle.reports.format.Manifest;
import settle.reports.format.Metric;
import settle.reports.format.Study;

/**
 * "A-priori ranking by a convex bound": each arm's value of the convex last-iterate bound for its planned rates (read
 * from reference.json), labelled a worst-case bound, and its rank beside the ranks by median tail radius and median
 * final gap ({@link Ranks}); otherwise why it is not shown.
 */
final class AprioriSection implements Section {

    @Override
    public String id() {
        return "a-priori";
    }

    @Override
    public String navigation() {
        return "A-priori bound";
    }

    @Override
    public String heading() {
        return "A-priori ranking by a convex bound";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        Manifest manifest = d.manifest();
        StudyAnalysis analysis = d.analysis();
        if (!study.convex()) {
            d.para("Not shown: the last-iterate bound holds for convex objectives, and " + manifest.model()
                    + " is not convex (the study has no reference minimiser θ*).");
            return;
        }
        Bound bound = study.reference().bound();
        if (!bound.computed()) {
            d.para("Not shown: " + bound.skipped() + ".");
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
        d.para("Ranks run from 1 (smallest) and ties share a rank. The empirical ranks are by the median over each "
                + "arm's finished replicates; an arm whose replicates all diverged has none.");
        w.open("div", "class", "scroll");
        w.open("table", "class", "compact", "id", "bound-ranking");
        d.tableHead("arm", "bound on E[F(θ_T)] − F(θ*) (worst case)", "rank by bound", "median tail radius", "rank",
                "median final gap", "rank");
        w.open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            w.open("tr");
            d.armHeader(a);
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
    }

    /** @return a rank from 1, or "—" for none (0) */
    private static String rank(int r) {
        return r == 0 ? "—" : Integer.toString(r);
    }
}
