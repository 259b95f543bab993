package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.api.Test;
import settle.input.BadInputException;

/** Every validation message, exactly: the key path, the value and the accepted range. */
class ScheduleValidationTest {

    private static final String KINDS = "constant, reciprocal, power-law, exponential, stepped, piecewise, plateau, "
            + "cosine, anneal, warmup-stable-decay, formula";

    static Stream<Arguments> rejected() {
        return Stream.of(
                Arguments.of(Maps.of("kind", "exponental", "rate", 0.1), "kind",
                        "unknown schedule kind 'exponental'; did you mean 'exponential'?"),
                Arguments.of(Maps.of("kind", "sgd"), "kind", "unknown schedule kind 'sgd'; expected one of " + KINDS),
                Arguments.of(Maps.of("rate", 0.1), "kind", "schedule kind is missing; expected one of " + KINDS),
                Arguments.of(Maps.of("kind", "reciprocal", "rate", 0.2, "decy", 1), "decy",
                        "reciprocal: unknown key 'decy'; did you mean 'decay'?"),
                Arguments.of(Maps.of("kind", "constant", "rate", 0.2, "per", "update"), "per",
                        "constant: unknown key 'per'; accepted keys: rate, warmup"),
                Arguments.of(Maps.of("kind", "reciprocal", "rate", -0.2, "decay", 1), "rate",
                        "reciprocal: rate = -0.2 is not accepted; expected a finite number > 0"),
                Arguments.of(Maps.of("kind", "constant", "rate", Double.NaN), "rate",
                        "constant: rate = NaN is not accepted; expected a finite number > 0"),
                Arguments.of(Maps.of("kind", "constant", "rate", Double.POSITIVE_INFINITY), "rate",
                        "constant: rate = Infinity is not accepted; expected a finite number > 0"),
                Arguments.of(Maps.of("kind", "constant", "rate", "fast"), "rate",
                        "constant: rate = 'fast' is not accepted; expected a number"),
                Arguments.of(Maps.of("kind", "constant", "rate", true), "rate",
                        "constant: rate = true is not accepted; expected a number"),
                Arguments.of(Maps.of("kind", "reciprocal", "rate", 0.2), "decay",
                        "reciprocal: decay is missing; expected a number"),
                Arguments.of(Maps.of("kind", "reciprocal", "rate", 0.2, "decay", -1), "decay",
                        "reciprocal: decay = -1 is not accepted; expected a finite number > 0"),
                Arguments.of(Maps.of("kind", "reciprocal", "rate", 0.2, "decay", 1, "per", "epochs"), "per",
                        "reciprocal: per = 'epochs' is not accepted; expected one of epoch | update (did you mean 'epoch'?)"),
                Arguments.of(Maps.of("kind", "power-law", "rate", 0.2, "power", 0), "power",
                        "power-law: power = 0 is not accepted; expected a finite number > 0"),
                Arguments.of(Maps.of("kind", "exponential", "rate", 0.1, "base", 1.5), "base",
                        "exponential: base = 1.5 is not accepted; expected a number in (0, 1)"),
                Arguments.of(Maps.of("kind", "stepped", "rate", 0.1, "cut", 1, "every", 2), "cut",
                        "stepped: cut = 1 is not accepted; expected a number in (0, 1)"),
                Arguments.of(Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5, "after", List.of(10, 5)), "after[1]",
                        "stepped: after[1] = 5 is not accepted; expected an integer > after[0] = 10 (after must be increasing)"),
                Arguments.of(Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5, "after", List.of(0, 5)), "after[0]",
                        "stepped: after[0] = 0 is not accepted; expected an integer ≥ 1"),
                Arguments.of(Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5, "after", List.of(2, "x")), "after[1]",
                        "stepped: after[1] = 'x' is not accepted; expected an integer"),
                Arguments.of(Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5, "every", 2, "after", List.of(3)), "every",
                        "stepped: give exactly one of every (a period in epochs) or after (a list of epochs)"),
                Arguments.of(Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5), "every",
                        "stepped: give exactly one of every (a period in epochs) or after (a list of epochs)"),
                Arguments.of(Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5, "every", 0), "every",
                        "stepped: every = 0 is not accepted; expected an integer ≥ 1"),
                Arguments.of(Maps.of("kind", "stepped", "rate", 0.1, "cut", 0.5, "every", 2.5), "every",
                        "stepped: every = 2.5 is not accepted; expected an integer"),
                Arguments.of(Maps.of("kind", "piecewise", "points", List.of(List.of(2, 0.1))), "points[0]",
                        "piecewise: points[0] = [2, 0.1] is not accepted; expected the first point at epoch 1, e.g. [1, 0.1]"),
                Arguments.of(Maps.of("kind", "piecewise", "points",
                        List.of(List.of(1, 0.1), List.of(5, 0.05), List.of(5, 0.01))), "points[2]",
                        "piecewise: points[2] = [5, 0.01] is not accepted; expected an epoch > 5 (epochs must increase)"),
                Arguments.of(Maps.of("kind", "piecewise", "points", List.of(List.of(1, -0.1))), "points[0]",
                        "piecewise: points[0] = [1, -0.1] is not accepted; expected a finite rate ≥ 0"),
                Arguments.of(Maps.of("kind", "piecewise", "points", List.of(List.of(1))), "points[0]",
                        "piecewise: points[0] = [1] is not accepted; expected a pair [epoch, rate]"),
                Arguments.of(Maps.of("kind", "piecewise"), "points",
                        "piecewise: points is missing; expected a list of [epoch, rate], e.g. [[1, 0.1], [10, 0.01]]"),
                Arguments.of(Maps.of("kind", "plateau", "rate", 0.1, "gain", "abc"), "gain",
                        "plateau: gain = 'abc' is not accepted; expected a percentage in [0%, 100%) such as 1%"),
                Arguments.of(Maps.of("kind", "plateau", "rate", 0.1, "gain", "150%"), "gain",
                        "plateau: gain = 150% is not accepted; expected a percentage in [0%, 100%) such as 1%"),
                Arguments.of(Maps.of("kind", "plateau", "rate", 0.1, "gain", -0.01), "gain",
                        "plateau: gain = -0.01 is not accepted; expected a percentage in [0%, 100%) such as 1%"),
                Arguments.of(Maps.of("kind", "plateau", "rate", 0.1, "judge", "holdot"), "judge",
                        "plateau: judge = 'holdot' is not accepted; expected one of train | holdout (did you mean 'holdout'?)"),
                Arguments.of(Maps.of("kind", "plateau", "rate", 0.1, "window", 0), "window",
                        "plateau: window = 0 is not accepted; expected an integer ≥ 1"),
                Arguments.of(Maps.of("kind", "plateau", "rate", 0.1, "rest", 1), "rest",
                        "plateau: 'rest' is not a key of plateau; it compares the mean judged loss of two consecutive"
                                + " windows of 'window' epochs and judges a new rate only on its own epochs (keys: rate,"
                                + " cut, window, gain, floor, judge)"),
                Arguments.of(Maps.of("kind", "plateau", "rate", 0.1, "cut", 0), "cut",
                        "plateau: cut = 0 is not accepted; expected a number in (0, 1)"),
                Arguments.of(Maps.of("kind", "plateau", "rate", 0.1, "floor", 0.5), "floor",
                        "plateau: floor = 0.5 is not accepted; expected a number in [0, rate = 0.1]"),
                Arguments.of(Maps.of("kind", "cosine", "rate", 0.1, "floor", 0.2), "floor",
                        "cosine: floor = 0.2 is not accepted; expected a number in [0, rate = 0.1]"),
                Arguments.of(Maps.of("kind", "cosine", "rate", 0.1, "restart-growth", 2), "restart-growth",
                        "cosine: restart-growth needs restart-every (the first cycle's length in epochs)"),
                Arguments.of(Maps.of("kind", "cosine", "rate", 0.1, "restart-every", 3, "restart-growth", 0.5),
                        "restart-growth", "cosine: restart-growth = 0.5 is not accepted; expected a finite number ≥ 1"),
                Arguments.of(Maps.of("kind", "cosine", "rate", 0.1, "restart-every", -3), "restart-every",
                        "cosine: restart-every = -3 is not accepted; expected a finite number > 0"),
                Arguments.of(Maps.of("kind", "anneal", "rate", 0.1, "power", -1), "power",
                        "anneal: power = -1 is not accepted; expected a finite number > 0"),
                Arguments.of(Maps.of("kind", "warmup-stable-decay", "rate", 0.1, "decay-from", 1), "decay-from",
                        "warmup-stable-decay: decay-from = 1 is not accepted; expected a fraction of the run in [0, 1)"),
                Arguments.of(Maps.of("kind", "warmup-stable-decay", "rate", 0.1, "shape", "sqrt"), "shape",
                        "warmup-stable-decay: shape = 'sqrt' is not accepted; expected one of linear | root"),
                Arguments.of(Maps.of("kind", "formula", "expr", "0.1/epok"), "expr",
                        "formula: expr = '0.1/epok' uses the unknown variable or function 'epok'; did you mean 'epoch'?"),
                Arguments.of(Maps.of("kind", "formula", "expr", "0.1*zeta(epoch)"), "expr",
                        "formula: expr = '0.1*zeta(epoch)' uses the unknown variable or function 'zeta'; "
                                + "expected variables epoch, update, progress, updates_per_epoch, total_updates"),
                Arguments.of(Maps.of("kind", "formula", "expr", " "), "expr",
                        "formula: expr = '' is not accepted; expected an expression of epoch, update, progress, "
                                + "updates_per_epoch, total_updates"),
                Arguments.of(Maps.of("kind", "formula"), "expr", "formula: expr is missing; expected a string"),
                Arguments.of(Maps.of("kind", "constant", "rate", 0.1, "warmup", Maps.of("epochs", 1, "updates", 3)),
                        "warmup", "constant: warmup = {epochs: 1, updates: 3} is not accepted; "
                                + "expected exactly one of {epochs: E} or {updates: W}"),
                Arguments.of(Maps.of("kind", "constant", "rate", 0.1, "warmup", Maps.of("epoch", 2)), "warmup.epoch",
                        "constant: unknown key 'warmup.epoch'; did you mean 'warmup.epochs'?"),
                Arguments.of(Maps.of("kind", "constant", "rate", 0.1, "warmup", Maps.of("epochs", 0)), "warmup.epochs",
                        "constant: warmup.epochs = 0 is not accepted; expected an integer ≥ 1"),
                Arguments.of(Maps.of("kind", "constant", "rate", 0.1, "warmup", 5), "warmup",
                        "constant: warmup = 5 is not accepted; expected a map {epochs: E} or {updates: W}"));
    }

    @ParameterizedTest
    @MethodSource("rejected")
    void rejectedWithExactMessage(Map<String, Object> map, String key, String message) {
        BadInputException e = assertThrows(BadInputException.class, () -> Schedules.parse(map));
        assertEquals(message, e.getMessage());
        assertEquals(key, e.key());
    }

    /** A warmup longer than the run is found when the run's shape is known. */
    @Test
    void warmupLongerThanTheRun() {
        Schedule s = Schedules.parse(Maps.of("kind", "constant", "rate", 0.1, "warmup", Maps.of("epochs", 5)));
        BadInputException e = assertThrows(BadInputException.class, () -> s.plannedRates(new RunShape(4, 3)));
        assertEquals("constant: warmup.epochs = 5 is not accepted; expected at most the run's 4 epochs "
                + "(a warmup longer than the run)", e.getMessage());
        assertEquals("warmup.epochs", e.key());
        // equal to the run is accepted: the rate reaches `rate` at the last update, 12/12
        double[] r = Schedules.parse(Maps.of("kind", "constant", "rate", 0.1, "warmup", Maps.of("epochs", 4)))
                .plannedRates(new RunShape(4, 3));
        assertEquals(0.1, r[11], 0.0);
    }

    /** A formula's result is checked when evaluated: 0.5 − 0.25·3 = −0.25 at epoch 3 (update 3 with 1 per epoch). */
    @Test
    void formulaNegativeWhenEvaluated() {
        Schedule s = Schedules.parse(Maps.of("kind", "formula", "expr", "0.5 - 0.25*epoch"));
        BadInputException e = assertThrows(BadInputException.class, () -> s.plannedRates(new RunShape(3, 1)));
        assertEquals("formula: expr = '0.5 - 0.25*epoch' gives -0.25 at epoch 3, update 3; expected a finite rate ≥ 0",
                e.getMessage());
        assertEquals("expr", e.key());
    }

    /** 1/(epoch − 1) at epoch 1 divides by zero. */
    @Test
    void formulaDivisionByZero() {
        Schedule s = Schedules.parse(Maps.of("kind", "formula", "expr", "1/(epoch-1)"));
        BadInputException e = assertThrows(BadInputException.class, () -> s.plannedRates(new RunShape(3, 1)));
        assertEquals("expr", e.key());
        assertEquals(true, e.getMessage().startsWith("formula: expr = '1/(epoch-1)' "), e.getMessage());
    }

    /** Numbers written as strings that read as numbers ("1e-3", which YAML 1.1 leaves a string) are accepted. */
    @Test
    void numericStringsAreNumbers() {
        Schedule s = Schedules.parse(Maps.of("kind", "constant", "rate", "1e-3"));
        assertEquals(new Constant(0.001, Warmup.NONE), s);
    }

    /** Plateau judging the holdout loss needs one. */
    @Test
    void plateauHoldoutWithoutHoldout() {
        RateDriver d = Schedules.parse(Maps.of("kind", "plateau", "rate", 0.1, "judge", "holdout"))
                .start(new RunShape(3, 1));
        d.rate(1, 1);
        BadInputException e = assertThrows(BadInputException.class, () -> d.epochEnded(1, 0.5, Double.NaN));
        assertEquals("plateau: judge = 'holdout' needs a holdout loss, but the run has none; expected judge: train, "
                + "or a plan with data.holdout-fraction > 0", e.getMessage());
        assertEquals("judge", e.key());
    }
}
