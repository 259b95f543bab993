package settle.reports.html.sections;

import settle.reports.metrics.VerdictSummary;
import java.util.ArrayList;
import java.util.List;
import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.format.Metric;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * "Every replicate": each replicate's status (diverged at which update, missing, or finished but did not learn: its
 * final objective above its starting one, kept in every comparison) and its per-replicate metrics.
 */
final class ReplicatesSection implements Section {

    @Override
    public String id() {
        return "replicates";
    }

    @Override
    public String navigation() {
        return "Replicates";
    }

    @Override
    public String heading() {
        return "Every replicate";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        StudyAnalysis analysis = d.analysis();
        d.para("Replicate k of every arm shares its seeds (initial weights and mini-batch order). "
                + "Values at the final iterate (the tail average for averaged arms).");
        List<Metric> columns = analysis.available();
        w.open("div", "class", "scroll tall");
        w.open("table", "class", "replicate-table");
        List<String> heads = new ArrayList<>(List.of("arm", "replicate", "status"));
        for (Metric m : columns) {
            heads.add(m.words());
        }
        d.tableHead(heads.toArray(new String[0]));
        w.open("tbody");
        for (int a = 0; a < study.armCount(); a++) {
            for (int k = 0; k < study.replicateCount(); k++) {
                Replicate r = study.replicate(a, k);
                boolean stalled = r != null && !r.diverged() && VerdictSummary.didNotLearn(r);
                w.open("tr", "class", r == null ? "missing" : r.diverged() ? "diverged" : stalled ? "did-not-learn"
                        : null);
                w.element("td", study.armName(a));
                w.element("td", Integer.toString(k + 1), "class", "num");
                w.element("td", r == null ? "missing" : r.diverged() ? "diverged at update " + r.divergedAtUpdate()
                        : stalled ? r.status() + ", did not learn (final objective above the starting one)"
                        : r.status());
                for (Metric m : columns) {
                    w.element("td", r == null || r.diverged() ? "—" : Format.sig(r.metric(m)), "class", "num");
                }
                w.close("tr");
            }
        }
        w.close("tbody").close("table");
        w.close("div");
    }
}
