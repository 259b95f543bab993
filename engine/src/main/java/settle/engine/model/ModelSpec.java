package settle.engine.model;

import java.util.List;
import java.util.Locale;

/**
 * What a plan's {@code model:} block (or the {@code trace}/{@code minimum} options) asks for, validated; it
 * builds the {@link Model} once the data's feature and class counts are known.
 *
 * <p>Kinds: {@code logistic} builds {@link BinaryLogistic} (sigmoid, class 1 positive) for two classes and
 * {@link SoftmaxRegression} for three or more; {@code mlp} builds {@link Mlp} (softmax output, a 2-way
 * softmax for two classes). Default {@code init}: {@code zeros} for logistic, {@code he} for mlp. Default
 * {@code activation}: {@code relu}. A logistic model has no hidden layers and no activation: those keys are
 * ignored for it (the spec holds an empty {@code hidden} list and a null {@code activation}).
 *
 * @param kind logistic or mlp
 * @param hidden hidden layer sizes (mlp: at least one, each ≥ 1; copied); null means none
 * @param activation the hidden layers' nonlinearity (mlp; null means relu)
 * @param l2 λ ≥ 0, finite: the penalty (λ/2)‖weights‖²
 * @param init how θ starts (null means the kind's default)
 */
public record ModelSpec(Kind kind, List<Integer> hidden, Activation activation, double l2, Initialisation init) {

    /** The model family (plan key {@code model.kind}). */
    public enum Kind {
        /** logistic regression: sigmoid for two classes, softmax for more (convex) */
        LOGISTIC,
        /** multilayer perceptron with a softmax output (not convex) */
        MLP;

        /** @return the plan spelling: {@code logistic} or {@code mlp} */
        public String key() {
            return name().toLowerCase(Locale.ROOT);
        }
    }

    /** Validates, fills defaults and copies {@code hidden}. */
    public ModelSpec {
        if (kind == null) {
            throw new IllegalArgumentException("model.kind must be logistic or mlp: missing");
        }
        if (!(l2 >= 0) || Double.isInfinite(l2)) {
            throw new IllegalArgumentException("model.l2 must be ≥ 0 and finite: " + number(l2));
        }
        if (kind == Kind.LOGISTIC) {
            hidden = List.of();
            activation = null;
            if (init == null) {
                init = Initialisation.standard(true);
            }
        } else {
            if (hidden == null || hidden.isEmpty()) {
                throw new IllegalArgumentException("model.hidden must list at least one layer size for kind mlp, "
                        + "e.g. [32]");
            }
            for (Integer size : hidden) {
                if (size == null || size < 1) {
                    throw new IllegalArgumentException("model.hidden sizes must be whole numbers ≥ 1: " + hidden);
                }
            }
            hidden = List.copyOf(hidden);
            if (activation == null) {
                activation = Activation.RELU;
            }
            if (init == null) {
                init = Initialisation.standard(false);
            }
            if (init == Initialisation.REFERENCE) {
                throw new IllegalArgumentException("model.init: reference needs a convex model (kind logistic); "
                        + "kind mlp accepts zeros, glorot or he");
            }
        }
    }

    /** @return a logistic spec with the default start (zeros) */
    public static ModelSpec logistic(double l2) {
        return new ModelSpec(Kind.LOGISTIC, null, null, l2, null);
    }

    /** @return an MLP spec with the default start (he) */
    public static ModelSpec mlp(List<Integer> hidden, Activation activation, double l2) {
        return new ModelSpec(Kind.MLP, hidden, activation, l2, null);
    }

    /** @return the same spec with another start */
    public ModelSpec withInit(Initialisation start) {
        return new ModelSpec(kind, hidden, activation, l2, start);
    }

    /** @return the plan spelling of an initialisation: zeros, reference, glorot or he */
    public static String key(Initialisation init) {
        return init.name().toLowerCase(Locale.ROOT);
    }

    /** @return true for the logistic kind (F convex, a reference minimiser exists when λ > 0) */
    public boolean convex() {
        return kind == Kind.LOGISTIC;
    }

    /**
     * Builds the model for data with {@code inputs} features and {@code classes} classes.
     *
     * @throws IllegalArgumentException when the counts are out of range
     */
    public Model build(int inputs, int classes) {
        if (inputs < 1) {
            throw new IllegalArgumentException("the data must have at least one feature: " + inputs);
        }
        if (classes < 2) {
            throw new IllegalArgumentException("the data must have at least two classes: " + classes);
        }
        if (kind == Kind.LOGISTIC) {
            return classes == 2 ? new BinaryLogistic(inputs, l2) : new SoftmaxRegression(inputs, classes, l2);
        }
        int[] sizes = new int[hidden.size()];
        for (int i = 0; i < sizes.length; i++) {
            sizes[i] = hidden.get(i);
        }
        return new Mlp(inputs, sizes, activation, classes, l2);
    }

    /** A number as a plan would spell it: integers without a trailing ".0". */
    private static String number(double value) {
        if (value == Math.rint(value) && Math.abs(value) < 1e15) {
            return Long.toString((long) value);
        }
        return Double.toString(value);
    }
}
