package settle.engine.minimum;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import settle.engine.model.BinaryLogistic;
import settle.engine.model.Model;
import settle.engine.model.SoftmaxRegression;

/** Reads the fixtures that make_fixture.py (scikit-learn 1.2.1) wrote beside itself. */
final class Fixtures {

    private Fixtures() {
    }

    /** Rows x (row-major), labels y, d and K of a fixture data file. */
    record Data(double[] x, int[] y, int features, int classes) {
        Model model(double l2) {
            return classes == 2 ? new BinaryLogistic(features, l2) : new SoftmaxRegression(features, classes, l2);
        }
    }

    /** The reference values of one case. */
    record Reference(double l2, double objective, double gradient, double[] theta) {
    }

    private static List<String> lines(String name) {
        try (InputStream in = Fixtures.class.getResourceAsStream(name)) {
            if (in == null) {
                throw new IllegalStateException("missing test resource " + name);
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8).lines().toList();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static Data data(String name) {
        List<String> lines = lines(name + ".csv");
        int features = lines.get(0).split(",").length - 1;
        int rows = lines.size() - 1;
        double[] x = new double[rows * features];
        int[] y = new int[rows];
        int classes = 0;
        for (int r = 0; r < rows; r++) {
            String[] cells = lines.get(r + 1).split(",");
            for (int j = 0; j < features; j++) {
                x[r * features + j] = Double.parseDouble(cells[j]);
            }
            y[r] = Integer.parseInt(cells[features]);
            classes = Math.max(classes, y[r] + 1);
        }
        return new Data(x, y, features, classes);
    }

    static Reference reference(String name) {
        Map<String, String[]> values = new HashMap<>();
        for (String line : lines(name + ".reference")) {
            if (line.startsWith("#") || line.isBlank()) {
                continue;
            }
            String[] parts = line.trim().split(" ");
            String[] rest = new String[parts.length - 1];
            System.arraycopy(parts, 1, rest, 0, rest.length);
            values.put(parts[0], rest);
        }
        String[] t = values.get("theta");
        double[] theta = new double[t.length];
        for (int i = 0; i < t.length; i++) {
            theta[i] = Double.parseDouble(t[i]);
        }
        return new Reference(Double.parseDouble(values.get("l2")[0]), Double.parseDouble(values.get("objective")[0]),
                Double.parseDouble(values.get("gradient")[0]), theta);
    }

    static double maxAbsDifference(double[] a, double[] b) {
        if (a.length != b.length) {
            throw new IllegalArgumentException(a.length + " vs " + b.length);
        }
        double m = 0;
        for (int i = 0; i < a.length; i++) {
            m = Math.max(m, Math.abs(a[i] - b[i]));
        }
        return m;
    }

    static List<Double> boxed(double[] a) {
        List<Double> out = new ArrayList<>(a.length);
        for (double v : a) {
            out.add(v);
        }
        return out;
    }
}
