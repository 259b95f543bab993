package settle.reports.html.sections;

import settle.reports.html.HtmlWriter;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.format.Manifest;
import settle.reports.format.Study;

/**
 * "Limits of this result": what the result does not say (this dataset, model and budget only; few replicates give
 * weak verdicts; the tail radius is small wherever a run froze; the prediction's reach).
 */
final class LimitsSection implements Section {

    @Override
    public String id() {
        return "limits";
    }

    @Override
    public String navigation() {
        return "Limits";
    }

    @Override
    public String heading() {
        return "Limits of this result";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        Manifest manifest = d.manifest();
        StudyAnalysis analysis = d.analysis();
        w.open("ul");
        w.element("li", "It holds for this dataset (" + manifest.dataSource() + "), this model (" + manifest.model()
                + "), this batch size, number of epochs and sampling, and these arms only: another dataset, model or "
                + "budget can rank the schedules differently.");
        w.element("li", "It rests on " + study.replicateCount() + " replicates per arm. Few replicates give weak "
                + "verdicts: with " + analysis.comparedArms() + " arm(s) compared, at least "
                + analysis.replicatesNeeded() + " are needed before any difference can be declared, and \"no "
                + "difference detected\" is never evidence of no difference.");
        w.element("li", "The verdict ranks arms by where their returned iterate ends (" + analysis.primary().words()
                + ") within this budget: an arm that ends closer may only travel faster, and with more epochs the "
                + "ranking can change. The tail radius measures how much a run still moves over its tail; a rate that "
                + "ends near zero makes it small wherever the run froze, which is why it is descriptive.");
        w.element("li", "The predicted noise ball linearises SGD at θ*: exact for a quadratic objective (reshuffled "
                + "batches and momentum included), approximate for logistic regression, whose curvature varies over "
                + "the ball: first order, with second-order terms for binary logistic regression without momentum "
                + "(the distance section says which). Measured against predicted tests the theory only for an arm "
                + "that has reached its ball; the distance section says which did.");
        w.element("li", "Test metrics are measured on one test split of " + manifest.testRows() + " rows.");
        w.close("ul");
    }
}
