package settle.reports.format;

import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import settle.input.BadInputException;
import settle.reports.format.JsonIn.Obj;
import settle.reports.format.JsonIn.Range;

/**
 * {@code reference.json}: its one writer and its one reader (README, "Study directory"). Reading checks every field:
 * θ* of length P, the eigenvalues ascending and of length P minus the gauge dimension, the bound with one value per arm
 * in index order under the arm's name.
 */
public final class ReferenceJson {

    private ReferenceJson() {
    }

    /** @return the file's bytes */
    public static byte[] write(Reference r) {
        return JsonOut.document(g -> {
            g.writeStartObject();
            g.writeNumberField("format", StudyFormat.VERSION);
            g.writeStringField("model", r.model());
            g.writeStringField("method", r.method());
            g.writeNumberField("iterations", r.iterations());
            g.writeBooleanField("converged", r.converged());
            JsonOut.number(g, "objective", r.objective());
            JsonOut.number(g, "gradient_norm", r.gradientNorm());
            JsonOut.array(g, "theta", r.theta());
            if (!r.curvature()) {
                g.writeStringField("curvature_skipped", r.curvatureSkipped());
            } else {
                g.writeNumberField("gauge_dimension", r.gaugeDimension());
                JsonOut.array(g, "eigenvalues", r.eigenvalues());
                JsonOut.number(g, "lambda_min", r.lambdaMin());
                JsonOut.number(g, "lambda_max", r.lambdaMax());
                JsonOut.number(g, "stability_bound", r.stabilityBound());
            }
            writeBound(g, r.bound());
            g.writeEndObject();
        });
    }

    private static void writeBound(JsonGenerator g, Bound b) throws IOException {
        g.writeObjectFieldStart("last_iterate_bound");
        g.writeStringField("source", b.source());
        g.writeStringField("rates", b.rates());
        if (!b.computed()) {
            g.writeStringField("skipped", b.skipped());
            g.writeEndObject();
            return;
        }
        JsonOut.number(g, "d", b.d());
        JsonOut.number(g, "g", b.g());
        g.writeArrayFieldStart("arms");
        for (int i = 0; i < b.values().length; i++) {
            g.writeStartObject();
            g.writeNumberField("index", i + 1);
            g.writeStringField("name", b.names().get(i));
            JsonOut.number(g, "value", b.values()[i]);
            g.writeEndObject();
        }
        g.writeEndArray();
        g.writeEndObject();
    }

    /**
     * Reads and checks {@code reference.json}.
     *
     * @param bytes the file's content
     * @param file the file as messages name it
     * @param parameters P, the model's parameter count (from the manifest)
     * @param arms the arms' names in index order (from the manifest)
     * @return the reference
     * @throws BadInputException naming the file and the field
     */
    public static Reference read(byte[] bytes, String file, int parameters, List<String> arms) {
        Obj r = JsonIn.read(bytes, file);
        int format = r.integer("format", Integer.MIN_VALUE, Integer.MAX_VALUE);
        if (format != StudyFormat.VERSION) {
            throw r.problem("format", "this file is in format " + format + "; this settle reads format "
                    + StudyFormat.VERSION);
        }
        String model = r.text("model");
        String method = r.choice("method", "newton", "lbfgs");
        int iterations = r.integer("iterations", 0, Integer.MAX_VALUE);
        boolean converged = r.bool("converged");
        double objective = r.number("objective", Range.NON_NEGATIVE);
        double gradientNorm = r.number("gradient_norm", Range.NON_NEGATIVE);
        double[] theta = r.numbers("theta", parameters, Range.ANY, false);
        Bound bound = bound(r.object("last_iterate_bound"), arms);
        if (r.has("curvature_skipped")) {
            return new Reference(model, method, iterations, converged, objective, gradientNorm, theta, -1, null,
                    Double.NaN, Double.NaN, Double.NaN, r.text("curvature_skipped"), bound);
        }
        int gauge = r.integer("gauge_dimension", 0, parameters - 1);
        double[] eigenvalues = r.numbers("eigenvalues", parameters - gauge, Range.ANY, false);
        for (int i = 1; i < eigenvalues.length; i++) {
            if (eigenvalues[i] < eigenvalues[i - 1]) {
                throw r.problem("eigenvalues[" + i + "]", "is smaller than the one before; they are listed ascending");
            }
        }
        double lambdaMin = r.number("lambda_min", Range.ANY);
        double lambdaMax = r.number("lambda_max", Range.ANY);
        if (lambdaMin != eigenvalues[0] || lambdaMax != eigenvalues[eigenvalues.length - 1]) {
            throw r.problem(lambdaMin != eigenvalues[0] ? "lambda_min" : "lambda_max", "differs from the "
                    + (lambdaMin != eigenvalues[0] ? "first" : "last") + " of 'eigenvalues'");
        }
        return new Reference(model, method, iterations, converged, objective, gradientNorm, theta, gauge, eigenvalues,
                lambdaMin, lambdaMax, r.numberOrNull("stability_bound", Range.POSITIVE), null, bound);
    }

    private static Bound bound(Obj b, List<String> arms) {
        String source = b.text("source");
        String rates = b.text("rates");
        if (b.has("skipped")) {
            return new Bound(source, rates, Double.NaN, Double.NaN, List.of(), new double[0], b.text("skipped"));
        }
        double d = b.number("d", Range.NON_NEGATIVE);
        double g = b.number("g", Range.NON_NEGATIVE);
        List<Obj> list = b.objects("arms");
        if (list.size() != arms.size()) {
            throw b.problem("arms", "lists " + list.size() + " arms; the study has " + arms.size());
        }
        List<String> names = new ArrayList<>();
        double[] values = new double[list.size()];
        for (int i = 0; i < values.length; i++) {
            Obj arm = list.get(i);
            arm.integer("index", i + 1, i + 1);
            String name = arm.text("name");
            if (!name.equals(arms.get(i))) {
                throw arm.problem("name", "is " + BadInputException.shown(name) + "; arm " + (i + 1) + " of this study"
                        + " is " + BadInputException.shown(arms.get(i)));
            }
            names.add(name);
            values[i] = arm.number("value", Range.NON_NEGATIVE);
        }
        return new Bound(source, rates, d, g, names, values, "");
    }
}
