package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * settle's schedules against the learning rates of a general-purpose deep-learning library's own
 * schedulers: Debian's python3-torch 1.13.1 (torch.optim.lr_scheduler), computed by
 * {@code src/test/resources/settle/engine/schedule/make_torch_fixture.py} into {@code torch_schedules.csv}.
 * That library counts epochs from 0 (index i, its scheduler stepped after each epoch); settle counts
 * epochs from 1. The mapping is written beside each check.
 */
class ScheduleTorchFixtureTest {

    /** The library's chainable schedulers update the rate recursively: rounding differs in the last bits. */
    private static final double RELATIVE = 1e-12;

    private static Map<String, List<Double>> fixture;

    @BeforeAll
    static void load() throws IOException {
        fixture = new LinkedHashMap<>();
        try (InputStream in = ScheduleTorchFixtureTest.class.getResourceAsStream("torch_schedules.csv");
                BufferedReader r = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8))) {
            String line = r.readLine();
            assertEquals("case,index,rate", line);
            while ((line = r.readLine()) != null) {
                String[] f = line.split(",");
                List<Double> list = fixture.computeIfAbsent(f[0], k -> new ArrayList<>());
                assertEquals(list.size(), Integer.parseInt(f[1]), "indices in order in " + f[0]);
                list.add(Double.parseDouble(f[2]));
            }
        }
    }

    private static List<Double> ref(String name) {
        List<Double> l = fixture.get(name);
        if (l == null || l.isEmpty()) {
            throw new AssertionError("fixture case missing: " + name);
        }
        return l;
    }

    private static void close(double expected, double actual, String what) {
        assertEquals(expected, actual, RELATIVE * Math.abs(expected), what);
    }

    /** StepLR(step_size=3, gamma=0.5) at index i ↔ stepped {rate 0.2, cut 0.5, every 3} at epoch e = i + 1. */
    @Test
    void steppedEveryMatchesStepLr() {
        List<Double> t = ref("step");
        double[] s = Maps.rates(t.size(), 1, "kind", "stepped", "rate", 0.2, "cut", 0.5, "every", 3);
        for (int i = 0; i < t.size(); i++) {
            close(t.get(i), s[i], "epoch " + (i + 1));
        }
    }

    /**
     * MultiStepLR(milestones=[2, 5, 6], gamma=0.1) at index i ↔ stepped {after: [2, 5, 6], cut 0.1} at epoch
     * e = i + 1: the library cuts once i ≥ m, settle once a &lt; e, the same condition.
     */
    @Test
    void steppedAfterMatchesMultiStepLr() {
        List<Double> t = ref("multistep");
        double[] s = Maps.rates(t.size(), 1, "kind", "stepped", "rate", 0.1, "cut", 0.1, "after", List.of(2, 5, 6));
        for (int i = 0; i < t.size(); i++) {
            close(t.get(i), s[i], "epoch " + (i + 1));
        }
    }

    /**
     * ExponentialLR(gamma=0.9) gives lr·γ^i at index i; settle's exponential gives rate·base^n with n = epoch
     * from 1. So settle's epoch e equals the library's index i = e (one ahead): settle never uses rate itself.
     */
    @Test
    void exponentialMatchesExponentialLrShiftedByOne() {
        List<Double> t = ref("exponential");
        int epochs = t.size() - 1;
        double[] s = Maps.rates(epochs, 1, "kind", "exponential", "rate", 0.1, "base", 0.9);
        for (int e = 1; e <= epochs; e++) {
            close(t.get(e), s[e - 1], "epoch " + e);
        }
    }

    /**
     * CosineAnnealingLR(T_max=10, eta_min=0.01) at index i ↔ cosine {rate 0.1, floor 0.01} over a run of 10
     * epochs (one update each) at epoch e = i + 1: p = (e − 1)/10 = i/T_max.
     */
    @Test
    void cosineMatchesCosineAnnealingLr() {
        List<Double> t = ref("cosine");
        double[] s = Maps.rates(10, 1, "kind", "cosine", "rate", 0.1, "floor", 0.01);
        for (int i = 0; i < t.size(); i++) {
            close(t.get(i), s[i], "epoch " + (i + 1));
        }
    }

    /**
     * CosineAnnealingWarmRestarts(T_0=3, T_mult=2, eta_min=0.001) at index i ↔ cosine {restart-every 3,
     * restart-growth 2, floor 0.001} at epoch e = i + 1 (x = e − 1 epochs elapsed = the library's epoch);
     * restarts at epochs 4 and 10 (indices 3 and 9).
     */
    @Test
    void cosineRestartsMatchWarmRestarts() {
        List<Double> t = ref("restarts");
        double[] s = Maps.rates(t.size(), 1, "kind", "cosine", "rate", 0.1, "floor", 0.001, "restart-every", 3,
                "restart-growth", 2);
        for (int i = 0; i < t.size(); i++) {
            close(t.get(i), s[i], "epoch " + (i + 1));
        }
    }

    /**
     * The same scheduler stepped with the fractional epoch j/4 (T_0=2, T_mult=2, eta_min=0, lr 0.05) ↔ cosine
     * per update with 4 updates per epoch at update u = j + 1: x = (u − 1)/4 = j/4.
     */
    @Test
    void cosineRestartsPerUpdateMatchFractionalEpochs() {
        List<Double> t = ref("restarts-per-update");
        double[] s = Maps.rates(9, 4, "kind", "cosine", "rate", 0.05, "restart-every", 2, "restart-growth", 2,
                "per", "update");
        assertEquals(t.size(), s.length);
        for (int j = 0; j < t.size(); j++) {
            close(t.get(j), s[j], "update " + (j + 1));
        }
    }

    /**
     * LinearLR(start_factor=1, end_factor=0.1, total_iters=10) at index i gives 0.1·(1 − 0.9·i/10) ↔ anneal
     * {rate 0.1, floor 0.01, power 1} over 10 epochs at epoch e = i + 1: 0.01 + 0.09·(1 − (e − 1)/10).
     */
    @Test
    void linearAnnealMatchesLinearLr() {
        List<Double> t = ref("linear");
        double[] s = Maps.rates(10, 1, "kind", "anneal", "rate", 0.1, "floor", 0.01);
        for (int i = 0; i < t.size(); i++) {
            close(t.get(i), s[i], "epoch " + (i + 1));
        }
    }

    /**
     * PolynomialLR(total_iters=8, power=2) at index i gives 0.1·(1 − i/8)² ↔ anneal {rate 0.1, floor 0,
     * power 2} over 8 epochs at epoch e = i + 1.
     */
    @Test
    void polynomialAnnealMatchesPolynomialLr() {
        List<Double> t = ref("polynomial");
        double[] s = Maps.rates(8, 1, "kind", "anneal", "rate", 0.1, "power", 2);
        for (int i = 0; i < t.size(); i++) {
            close(t.get(i), s[i], "epoch " + (i + 1));
        }
    }
}
