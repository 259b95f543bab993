package settle.engine.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * Batch objectives, gradients and probabilities against PyTorch autograd in float64 (Debian's python3-torch
 * 1.13.1+dfsg-4; the fixture {@code model_gradients.txt} and the script that made it, {@code make_fixture.py},
 * sit together under src/test/resources/settle/engine/model/).
 */
class TorchFixtureTest {

    /** Both sides compute in float64 with different summation orders. */
    private static final double AGREEMENT = 1e-12;

    private record Case(String name, String kind, String activation, double l2, int n, int d, int k, int[] hidden,
            Map<String, String[]> items) {
        double[] doubles(String key) {
            String[] v = items.get(key);
            double[] out = new double[v.length];
            for (int i = 0; i < v.length; i++) {
                out[i] = Double.parseDouble(v[i]);
            }
            return out;
        }

        int[] ints(String key) {
            String[] v = items.get(key);
            int[] out = new int[v.length];
            for (int i = 0; i < v.length; i++) {
                out[i] = Integer.parseInt(v[i]);
            }
            return out;
        }

        Model model() {
            return switch (kind) {
                case "binary" -> new BinaryLogistic(d, l2);
                case "softmax" -> new SoftmaxRegression(d, k, l2);
                default -> new Mlp(d, hidden, Activation.valueOf(activation.toUpperCase(java.util.Locale.ROOT)), k, l2);
            };
        }
    }

    private static List<Case> cases() throws IOException {
        List<Case> cases = new ArrayList<>();
        try (InputStream in = TorchFixtureTest.class.getResourceAsStream("model_gradients.txt")) {
            assertNotNull(in, "fixture model_gradients.txt is missing");
            BufferedReader reader = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8));
            String line;
            String[] head = null;
            Map<String, String[]> items = null;
            while ((line = reader.readLine()) != null) {
                String[] parts = line.strip().split("\\s+");
                if (parts[0].equals("case")) {
                    if (head != null) {
                        cases.add(toCase(head, items));
                    }
                    head = parts;
                    items = new HashMap<>();
                } else {
                    items.put(parts[0], java.util.Arrays.copyOfRange(parts, 1, parts.length));
                }
            }
            cases.add(toCase(head, items));
        }
        return cases;
    }

    private static Case toCase(String[] h, Map<String, String[]> items) {
        int[] hidden = h[8].equals("-") ? new int[0]
                : java.util.Arrays.stream(h[8].split(",")).mapToInt(Integer::parseInt).toArray();
        return new Case(h[1], h[2], h[3], Double.parseDouble(h[4]), Integer.parseInt(h[5]), Integer.parseInt(h[6]),
                Integer.parseInt(h[7]), hidden, items);
    }

    @Test
    void objectiveGradientAndProbabilitiesMatchAutograd() throws IOException {
        List<Case> cases = cases();
        assertEquals(5, cases.size());
        for (Case c : cases) {
            Model model = c.model();
            double[] x = c.doubles("x");
            int[] y = c.ints("y");
            double[] theta = c.doubles("theta");
            assertEquals(model.parameterCount(), theta.length, c.name());
            double[] gradient = new double[theta.length];
            Model.Workspace ws = model.workspace(c.n());
            double objective = model.batchObjective(theta, x, y, c.n(), gradient, ws);
            double expected = c.doubles("objective")[0];
            assertEquals(expected, objective, AGREEMENT * expected, c.name());
            double[] reference = c.doubles("gradient");
            double scale = 0;
            for (double g : reference) {
                scale = Math.max(scale, Math.abs(g));
            }
            assertTrue(scale > 1e-3, c.name());
            for (int i = 0; i < theta.length; i++) {
                assertEquals(reference[i], gradient[i], AGREEMENT * scale, c.name() + " component " + i);
            }
            double[] p = new double[c.n() * model.classes()];
            model.probabilities(theta, x, c.n(), p, ws);
            double[] referenceP = c.doubles("probabilities");
            for (int i = 0; i < p.length; i++) {
                assertEquals(referenceP[i], p[i], AGREEMENT, c.name() + " probability " + i);
            }
        }
    }
}
