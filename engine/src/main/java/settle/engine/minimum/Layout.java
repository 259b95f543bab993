package settle.engine.minimum;

import settle.engine.model.Model;

/**
 * The parameter layout of a logistic model as DESIGN.md fixes it. Binary (sigmoid): the d weights, then the
 * bias; one output unit. Multinomial (softmax): class 0's d weights, class 1's, …, then the K biases; K output
 * units. Coefficient j of unit u multiplies x̃_j, with x̃ = (x, 1): j = d is the bias.
 */
final class Layout {

    final int inputs;
    final int classes;
    /** output units: 1 for the sigmoid form, K for softmax */
    final int units;
    final int parameters;
    final boolean binary;

    private Layout(int inputs, int classes, boolean binary) {
        this.inputs = inputs;
        this.classes = classes;
        this.binary = binary;
        this.units = binary ? 1 : classes;
        this.parameters = units * (inputs + 1);
    }

    /**
     * @throws IllegalArgumentException when the model is not a logistic model with the documented layout
     */
    static Layout of(Model model) {
        int d = model.inputs();
        int k = model.classes();
        int p = model.parameterCount();
        if (model.convex() && d >= 1 && k == 2 && p == d + 1) {
            return new Layout(d, k, true);
        }
        if (model.convex() && d >= 1 && k > 2 && p == k * (d + 1)) {
            return new Layout(d, k, false);
        }
        throw new IllegalArgumentException("the exact minimiser needs a logistic model (binary: d + 1 parameters,"
                + " multinomial: K(d + 1)); got " + model.describe() + " with " + p + " parameters");
    }

    /** @return the index in θ of coefficient j (0..d, d = bias) of output unit u */
    int index(int unit, int j) {
        if (binary) {
            return j;
        }
        return j < inputs ? unit * inputs + j : classes * inputs + unit;
    }

    /** @return true when θ[index] is a bias */
    boolean isBias(int index) {
        return binary ? index == inputs : index >= classes * inputs;
    }
}
