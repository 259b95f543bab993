package settle.reports.html.sections;

import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.metrics.Replicates;
import settle.reports.format.Manifest;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * "Provenance": the commands that reproduce the study and rebuild the report, what the manifest records (tool,
 * command, JVM, CPU, executor, generator and seed, times, hashes, data, model), the reference minimiser, each
 * replicate's seeds, and the resolved plan text as written in plan.yaml.
 */
final class ProvenanceSection implements Section {

    @Override
    public String id() {
        return "provenance";
    }

    @Override
    public String navigation() {
        return "Provenance";
    }

    @Override
    public String heading() {
        return "Provenance";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        Manifest manifest = d.manifest();
        String dir = study.directory().toString();
        w.open("p");
        w.text("Reproduce this study (the plan below is the resolved plan, every default filled in): ");
        w.element("code", "settle run " + study.directory().resolve("plan.yaml") + " --out " + dir);
        w.text("; rebuild this report: ");
        w.element("code", "settle report " + dir);
        w.text(".");
        w.close("p");
        w.open("dl", "class", "facts");
        fact(d, "tool", "settle " + manifest.toolVersion() + (manifest.gitCommit().isEmpty() ? ""
                : ", commit " + manifest.gitCommit()));
        fact(d, "command recorded", String.join(" ", manifest.command()));
        fact(d, "JVM", manifest.jvm());
        fact(d, "CPU", manifest.cpu());
        String threads = manifest.threads() + (manifest.threads() == 1 ? " thread" : " threads");
        fact(d, "executor", manifest.executor().endsWith(threads) ? manifest.executor()
                : manifest.executor() + " (" + threads + ")");
        fact(d, "started – ended", manifest.started() + " – " + (manifest.ended().isEmpty() ? "(not ended)"
                : manifest.ended()));
        fact(d, "random generator", manifest.generator() + ", root seed " + manifest.rootSeed());
        fact(d, "plan SHA-256", manifest.planSha256());
        fact(d, "data SHA-256", manifest.dataSha256());
        fact(d, "split SHA-256", manifest.splitSha256());
        fact(d, "data", manifest.dataSource() + ": " + manifest.rows() + " rows, " + manifest.trainRows()
                + " training, " + manifest.testRows() + " test");
        fact(d, "features", String.join(", ", manifest.featureNames()));
        fact(d, "classes", String.join(", ", manifest.classNames()));
        fact(d, "model", manifest.model() + ", " + manifest.parameters() + " parameters");
        if (study.convex()) {
            fact(d, "reference minimiser", study.reference().method() + ": F(θ*) = "
                    + Format.sig(study.reference().objective()) + ", gradient norm "
                    + Format.sig(study.reference().gradientNorm())
                    + (Double.isFinite(study.reference().stabilityBound()) ? ", stability bound 2/λmax = "
                            + Format.sig(study.reference().stabilityBound()) : ""));
        }
        w.close("dl");
        w.element("h3", "Seeds of each replicate (shared by every arm)");
        w.open("div", "class", "scroll");
        w.open("table", "class", "compact");
        d.tableHead("replicate", "initialisation seed", "sampling seed");
        w.open("tbody");
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
    }

    /** Writes one term of the facts list and its value. */
    private static void fact(Drawing d, String term, String value) {
        HtmlWriter w = d.writer();
        w.element("dt", term);
        w.element("dd", value);
    }
}
