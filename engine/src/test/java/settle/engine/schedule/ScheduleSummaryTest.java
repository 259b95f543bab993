package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import settle.engine.schedule.Asymptotics.Limit;

/** Sums over a planned run, the asymptotic class, the one-line description and the resolved map. */
class ScheduleSummaryTest {

    private static final double EXACT = 1e-15;

    static Stream<Map<String, Object>> everyKind() {
        return Stream.of(
                Maps.of("kind", "constant", "rate", 0.1),
                Maps.of("kind", "reciprocal", "rate", 0.2, "decay", 1, "warmup", Maps.of("epochs", 1)),
                Maps.of("kind", "power-law", "rate", 0.2, "power", 0.5, "per", "update"),
                Maps.of("kind", "exponential", "rate", 0.2, "base", 0.9),
                Maps.of("kind", "stepped", "rate", 0.2, "cut", 0.5, "every", 10),
                Maps.of("kind", "stepped", "rate", 0.2, "cut", 0.5, "after", List.of(10, 20)),
                Maps.of("kind", "piecewise", "points", List.of(List.of(1, 0.1), List.of(5, 0.01))),
                Maps.of("kind", "plateau", "rate", 0.1, "gain", "1%", "warmup", Maps.of("updates", 10)),
                Maps.of("kind", "plateau", "rate", 0.1, "gain", "0.1%", "window", 3, "judge", "holdout"),
                Maps.of("kind", "cosine", "rate", 0.1),
                Maps.of("kind", "cosine", "rate", 0.1, "restart-every", 5, "restart-growth", 2),
                Maps.of("kind", "anneal", "rate", 0.1, "floor", 0.001),
                Maps.of("kind", "warmup-stable-decay", "rate", 0.1, "shape", "root"),
                Maps.of("kind", "formula", "expr", "0.1 / (1 + epoch)"));
    }

    /** resolved() parses back to an equal schedule, and resolving again gives the same map. */
    @ParameterizedTest
    @MethodSource("everyKind")
    void resolvedParsesBackToAnEqualSchedule(Map<String, Object> map) {
        Schedule s = Schedules.parse(map);
        Map<String, Object> resolved = s.resolved();
        Schedule back = Schedules.parse(resolved);
        assertEquals(s, back);
        assertEquals(resolved, back.resolved());
        assertEquals(s.kind(), resolved.get("kind"));
    }

    @Test
    void resolvedFillsEveryDefault() {
        assertEquals(Maps.of("kind", "plateau", "rate", 0.1, "cut", 0.5, "window", 5, "gain", "1%",
                "floor", 0.0, "judge", "train"), Schedules.parse(Maps.of("kind", "plateau", "rate", 0.1)).resolved());
        assertEquals(Maps.of("kind", "reciprocal", "rate", 0.2, "decay", 1.0, "per", "epoch", "warmup",
                Maps.of("epochs", 1)), Schedules.parse(Maps.of("kind", "reciprocal", "rate", 0.2, "decay", 1,
                        "warmup", Maps.of("epochs", 1))).resolved());
        assertEquals(Maps.of("kind", "warmup-stable-decay", "rate", 0.1, "decay-from", 0.8, "floor", 0.0,
                "shape", "linear", "per", "epoch"),
                Schedules.parse(Maps.of("kind", "warmup-stable-decay", "rate", 0.1)).resolved());
        assertEquals("1%", Schedules.parse(Maps.of("kind", "plateau", "rate", 0.1, "gain", "1%")).resolved().get("gain"));
        assertEquals("0.5%", Schedules.parse(Maps.of("kind", "plateau", "rate", 0.1, "gain", "0.50%")).resolved()
                .get("gain"));
    }

    /**
     * Σα and Σα² of the standard reciprocal example over 4 epochs × 3 updates: Σα = 3·(0.1 + 0.2/3 + 0.05 +
     * 0.04) = 0.77; Σα² = 3·(0.01 + 0.04/9 + 0.0025 + 0.0016) = 0.0556333…
     */
    @Test
    void sumsOverThePlannedRun() {
        RateSums sums = Schedules.parse(Maps.of("kind", "reciprocal", "rate", 0.2, "decay", 1)).sums(new RunShape(4, 3));
        assertEquals(0.77, sums.sum(), EXACT);
        assertEquals(3 * (0.01 + 0.04 / 9 + 0.0025 + 0.0016), sums.sumOfSquares(), EXACT);
        assertEquals(0.1, sums.first(), EXACT);
        assertEquals(0.04, sums.last(), EXACT);
    }

    /** Robbins &amp; Monro (1951): Σα = ∞ and Σα² &lt; ∞; Σ n^(−p) diverges iff p ≤ 1 (the p-series test). */
    @Test
    void asymptoticClasses() {
        assertClass(Limit.INFINITE, Limit.FINITE, Maps.of("kind", "reciprocal", "rate", 0.2, "decay", 1, "per", "update"));
        assertClass(Limit.INFINITE, Limit.INFINITE, Maps.of("kind", "constant", "rate", 0.1));
        assertClass(Limit.INFINITE, Limit.FINITE, Maps.of("kind", "power-law", "rate", 0.1, "power", 0.75));
        assertClass(Limit.INFINITE, Limit.FINITE, Maps.of("kind", "power-law", "rate", 0.1, "power", 1));
        assertClass(Limit.INFINITE, Limit.INFINITE, Maps.of("kind", "power-law", "rate", 0.1, "power", 0.5));
        assertClass(Limit.FINITE, Limit.FINITE, Maps.of("kind", "power-law", "rate", 0.1, "power", 1.5));
        assertClass(Limit.FINITE, Limit.FINITE, Maps.of("kind", "exponential", "rate", 0.1, "base", 0.9));
        assertClass(Limit.FINITE, Limit.FINITE, Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5, "every", 3));
        assertClass(Limit.INFINITE, Limit.INFINITE, Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5, "after", List.of(3)));
        assertClass(Limit.FINITE, Limit.FINITE, Maps.of("kind", "piecewise", "points", List.of(List.of(1, 0.1), List.of(3, 0))));
        assertClass(Limit.INFINITE, Limit.INFINITE, Maps.of("kind", "piecewise", "points", List.of(List.of(1, 0.1))));
        assertClass(Limit.UNDECIDED, Limit.UNDECIDED, Maps.of("kind", "plateau", "rate", 0.1));
        assertClass(Limit.INFINITE, Limit.INFINITE, Maps.of("kind", "plateau", "rate", 0.1, "floor", 0.01));
        assertClass(Limit.INFINITE, Limit.INFINITE, Maps.of("kind", "cosine", "rate", 0.1));
        assertClass(Limit.INFINITE, Limit.INFINITE, Maps.of("kind", "anneal", "rate", 0.1));
        assertClass(Limit.UNDECIDED, Limit.UNDECIDED, Maps.of("kind", "formula", "expr", "0.1/epoch"));
        Asymptotics rm = Schedules.parse(Maps.of("kind", "reciprocal", "rate", 0.2, "decay", 1)).asymptotics();
        assertEquals("Σα = ∞, Σα² < ∞", rm.sums());
        assertEquals("Robbins–Monro: Σα = ∞ and Σα² < ∞; it keeps moving and settles as the run grows", rm.description());
    }

    private static void assertClass(Limit sum, Limit squares, Map<String, Object> map) {
        Asymptotics a = Schedules.parse(map).asymptotics();
        assertEquals(sum, a.sum(), map.toString());
        assertEquals(squares, a.sumOfSquares(), map.toString());
    }

    @Test
    void describeOnOneLine() {
        assertEquals("reciprocal: α = 0.2 / (1 + 1·n), n = epoch (from 1); warmup: × min(1, t/W), W = 2 epochs of updates",
                Schedules.parse(Maps.of("kind", "reciprocal", "rate", 0.2, "decay", 1, "warmup", Maps.of("epochs", 2)))
                        .describe());
        assertEquals("stepped: α = 0.2 · 0.5^j, j = #{a ∈ [10, 20] : a < epoch}",
                Schedules.parse(Maps.of("kind", "stepped", "rate", 0.2, "cut", 0.5, "after", List.of(10, 20))).describe());
        assertEquals("cosine: α = 0 + (0.1 − 0)·(1 + cos(π·p))/2, p = progress within cycles of 5 epochs, each next "
                + "2× longer (per epoch)", Schedules.parse(Maps.of("kind", "cosine", "rate", 0.1, "restart-every", 5,
                        "restart-growth", 2)).describe());
        assertEquals("plateau: α starts at 0.1; once the mean train loss of the last 5 epochs is not 1% below that of"
                + " the 5 before (both at the current rate), α ← max(α·0.5, 0) from the next epoch",
                Schedules.parse(Maps.of("kind", "plateau", "rate", 0.1, "gain", "1%")).describe());
        everyKind().forEach(m -> assertEquals(-1, Schedules.parse(m).describe().indexOf('\n')));
    }

    @Test
    void kindsInTableOrder() {
        assertEquals(List.of("constant", "reciprocal", "power-law", "exponential", "stepped", "piecewise", "plateau",
                "cosine", "anneal", "warmup-stable-decay", "formula"), Schedules.kinds());
    }
}
