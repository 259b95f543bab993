package settle.reports.html.sections;

import settle.reports.format.Manifest;
import settle.reports.format.Study;
import settle.reports.html.HtmlWriter;
import settle.reports.metrics.Coefficients;
import settle.reports.text.Format;
import settle.reports.text.Names;

/**
 * "Coefficients": the reference minimiser θ*'s largest weights by magnitude, each labelled by its input's name as
 * the study recorded it (a one-hot level {@code colour=red}, an imputed column's {@code glucose (was missing)}); one
 * table for binary logistic regression, one per class for softmax ({@link Coefficients}).
 */
final class CoefficientsSection implements Section {

    /** Weights shown per class. */
    static final int SHOWN = 10;

    @Override
    public String id() {
        return "coefficients";
    }

    @Override
    public String navigation() {
        return "Coefficients";
    }

    @Override
    public String heading() {
        return "The minimiser's largest coefficients";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        Study study = d.study();
        Manifest m = d.manifest();
        if (!study.convex()) {
            d.para("The model has no reference minimiser (it is not convex), so there are no coefficients of θ* to"
                    + " show.");
            return;
        }
        Coefficients co = Coefficients.of(study.reference().theta(), m.data().features(), m.classNames());
        if (co == null) {
            d.para("θ* has " + study.reference().theta().length + " values, which is not the layout of a logistic"
                    + " model over " + m.data().features() + " inputs; its coordinates are not labelled.");
            return;
        }
        int d0 = m.data().features();
        String units = m.standardisation() != null
                ? "The inputs were standardised on the training split, so a weight is the change per standard"
                        + " deviation of its input, and weights of different inputs compare."
                : "The inputs were not standardised, so a weight is per unit of its input, and weights of inputs on"
                        + " different scales do not compare.";
        String meaning = co.binary()
                ? "A positive weight raises the log-odds of class " + quoted(co.groups().get(0).className())
                        + " against " + quoted(co.groups().get(0).against()) + "."
                : "A weight raises its class's score; only the differences between the classes' weights of an input"
                        + " change a prediction.";
        d.para("The " + Math.min(SHOWN, d0) + " weights of θ* largest in magnitude" + (co.binary() ? "" : " per class")
                + ", of " + d0 + " inputs, by input name (" + (study.encoding() != null && study.encoding().table()
                ? "a categorical column gives one input per level, column=level; an imputed number column is"
                        + " followed by its 0/1 \"(was missing)\" input"
                : "the data's feature names") + "). " + meaning + " " + units);
        w.open("div", "class", "multiples");
        for (Coefficients.Group g : co.groups()) {
            w.open("table", "class", "verdict-table");
            w.open("caption").text(co.binary() ? "log-odds of " + quoted(g.className()) + " against "
                    + quoted(g.against()) : "class " + quoted(g.className())).close("caption");
            d.tableHead("input", "weight");
            w.open("tbody");
            for (int j : g.largest(SHOWN)) {
                w.open("tr");
                w.element("th", study.featureName(j), "scope", "row");
                w.element("td", Format.sig(g.weights()[j]), "class", "num");
                w.close("tr");
            }
            w.open("tr", "class", "row-shade");
            w.element("th", "(bias)", "scope", "row");
            w.element("td", Format.sig(g.bias()), "class", "num");
            w.close("tr");
            w.close("tbody");
            w.close("table");
        }
        w.close("div");
    }

    private static String quoted(String name) {
        return "'" + Names.shown(name) + "'";
    }
}
