package settle.reports.format;

import com.fasterxml.jackson.core.io.NumberOutput;

/**
 * How every number of a study directory is written (JSON and CSV alike): a double in its shortest round-trip decimal
 * form, the same on any JDK.
 *
 * <p>The form is the one JDK 19 and later give from {@code Double.toString} (the digits: the shortest decimal that
 * rounds back to the double, the closest to it among those, an even last digit on a tie; the layout: Java's, e.g.
 * {@code 0.1}, {@code 100.0}, {@code 1.0E23}, {@code 4.9E-324}). JDK 17's {@code Double.toString} is not always the
 * shortest ({@code 1.0E23} comes out as {@code 9.999999999999999E22}, {@code 2.0E23} as {@code 1.9999999999999998E23}),
 * so the same study written on JDK 17 and JDK 21 would differ byte for byte. The digits come from Raffaello
 * Giulietti's Schubfach algorithm ("The Schubfach way to render doubles", 2020), the algorithm of JDK 19's
 * {@code Double.toString}, in the port that jackson-core (2.23.0, already settle's JSON library) ships as
 * {@code com.fasterxml.jackson.core.io.schubfach.DoubleToDecimal}; {@code NumberTextTest} checks it against JDK 25's
 * {@code Double.toString} on edge values and against the definition on random doubles.
 */
public final class NumberText {

    private NumberText() {
    }

    /**
     * @param v a finite double (NaN and the infinities are written as {@code NaN}, {@code Infinity},
     *     {@code -Infinity}; the study files write null for them, see {@link JsonOut})
     * @return its shortest round-trip form
     */
    public static String shortest(double v) {
        return NumberOutput.toString(v, true);
    }
}
