package settle.reports.metrics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** First and last rate, Σα and Σα² of a rate sequence, as the rates table shows them; sums worked out by hand. */
class RateSummaryTest {

    @Test
    void sumsLeaveOutWhatIsNotFinite() {
        RateSummary s = RateSummary.of(new double[] {0.5, 0.25, Double.NaN, 0.125});
        assertEquals(0.5, s.first());
        assertEquals(0.125, s.last());
        // Σα = 0.5 + 0.25 + 0.125 = 0.875; Σα² = 0.25 + 0.0625 + 0.015625 = 0.328125 (exact in binary)
        assertEquals(0.875, s.sum());
        assertEquals(0.328125, s.sumOfSquares());
        assertEquals(4, s.updates(), "the NaN update still counts as run");
    }

    @Test
    void noRatesHaveNoFirstOrLast() {
        RateSummary s = RateSummary.of(new double[0]);
        assertTrue(Double.isNaN(s.first()) && Double.isNaN(s.last()));
        assertEquals(0, s.sum());
        assertEquals(0, s.updates());
    }
}
