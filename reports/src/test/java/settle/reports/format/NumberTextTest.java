package settle.reports.format;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The JSON (and CSV) number writer gives the shortest round-trip form on any JDK, checked two ways:
 *
 * <ul>
 *   <li>against a reference: {@code shortest-doubles.txt}, 8 547 doubles (zeros, subnormals, the extremes, every power
 *       of ten and its neighbours, powers of two, known hard cases such as 1e23 and 2e23, 6 000 seeded random ones)
 *       with the text JDK 25's {@code Double.toString} gives them (Eclipse Adoptium 25.0.3: since JDK 19 it is
 *       Raffaello Giulietti's Schubfach, "The Schubfach way to render doubles", 2020, JDK-4511638); the program that
 *       wrote the file, {@code ShortestDoubles.java}, lies beside it;</li>
 *   <li>against the definition, on 20 000 seeded random doubles: the text reads back as the same double, and no
 *       decimal with one significant digit fewer does (checked with exact BigDecimal arithmetic, no library
 *       involved).</li>
 * </ul>
 * JDK 17's {@code Double.toString} fails the first check (1.0E23 comes out as 9.999999999999999E22), which is why the
 * study files do not use it.
 */
class NumberTextTest {

    @Test
    void matchesJdk25DoubleToStringOnEdgeAndRandomValues() throws IOException {
        String text;
        try (InputStream in = NumberTextTest.class.getResourceAsStream("shortest-doubles.txt")) {
            text = new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
        int checked = 0;
        for (String line : text.split("\n")) {
            if (line.startsWith("#") || line.isBlank()) {
                continue;
            }
            String[] parts = line.split("\t");
            double d = Double.longBitsToDouble(Long.parseUnsignedLong(parts[0], 16));
            assertEquals(parts[1], NumberText.shortest(d), "bits " + parts[0]);
            checked++;
        }
        assertEquals(8547, checked, "every line of the reference was compared");
    }

    @Test
    void theKnownJdk17DifferencesAreShortest() {
        assertEquals("1.0E23", NumberText.shortest(1e23));
        assertEquals("2.0E23", NumberText.shortest(2e23));
        assertEquals("8.41E21", NumberText.shortest(8.41e21));
        assertEquals("4.9E-324", NumberText.shortest(Double.MIN_VALUE));
        assertEquals("0.1", NumberText.shortest(0.1));
        assertEquals("100.0", NumberText.shortest(100));
        assertEquals("-0.0", NumberText.shortest(-0.0));
    }

    @Test
    void readsBackAndNoShorterDecimalDoes() {
        SplittableRandom random = new SplittableRandom(7);
        int checked = 0;
        while (checked < 20_000) {
            double d = checked % 2 == 0 ? Double.longBitsToDouble(random.nextLong())
                    : random.nextDouble() * Math.pow(10, random.nextInt(-30, 30));
            if (!Double.isFinite(d) || d == 0) {
                continue;
            }
            String s = NumberText.shortest(d);
            assertEquals(d, Double.parseDouble(s), s);
            int digits = significantDigits(s);
            if (digits > 1) {
                BigDecimal exact = new BigDecimal(d);
                MathContext fewer = new MathContext(digits - 1, RoundingMode.FLOOR);
                BigDecimal down = exact.round(fewer);
                BigDecimal up = exact.round(new MathContext(digits - 1, RoundingMode.CEILING));
                assertNotEquals(d, down.doubleValue(), s + ": " + down + " is shorter and reads back");
                assertNotEquals(d, up.doubleValue(), s + ": " + up + " is shorter and reads back");
            }
            checked++;
        }
        assertTrue(checked == 20_000);
    }

    /** @return the significant digits of Java's decimal form ({@code 1.25E-5}, {@code 0.0125}, {@code 120.0}) */
    private static int significantDigits(String s) {
        String mantissa = s.replace("-", "");
        int e = mantissa.indexOf('E');
        if (e >= 0) {
            mantissa = mantissa.substring(0, e);
        }
        String digits = mantissa.replace(".", "").replaceFirst("^0+", "").replaceFirst("0+$", "");
        return Math.max(1, digits.length());
    }
}
