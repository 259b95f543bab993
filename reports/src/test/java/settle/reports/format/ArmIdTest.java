package settle.reports.format;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** An arm's id, the name of its directory: the README's rule ("Study directory"), spelled out case by case. */
class ArmIdTest {

    /** A made-up SHA-256 in hexadecimal; the id takes its first 12 digits. */
    private static final String HASH = "0123456789abcdef".repeat(4);

    @Test
    void theNameMadeSafeThenTheFirstTwelveDigitsOfTheHash() {
        assertEquals("constant-0123456789ab", StudyFormat.armId("constant", HASH));
        assertEquals("reciprocal__per_update-0123456789ab", StudyFormat.armId("reciprocal, per update", HASH));
        assertEquals("reciprocal_rate_0.25_decay_0.1_-0123456789ab",
                StudyFormat.armId("reciprocal[rate=0.25,decay=0.1]", HASH));
        assertEquals("_HYPERLINK_x_-0123456789ab", StudyFormat.armId("=HYPERLINK(x)", HASH), "no formula, no path");
        assertEquals("_..-0123456789ab", StudyFormat.armId("...", HASH), "never a hidden name");
        assertEquals("__-0123456789ab", StudyFormat.armId("é/", HASH), "one _ per character, a separator too");
        assertEquals("x".repeat(40) + "-0123456789ab", StudyFormat.armId("x".repeat(70), HASH), "cut to 40");
    }

    @Test
    void idsAreRecognisedByTheirForm() {
        assertTrue(StudyFormat.isArmId(StudyFormat.armId("reciprocal, per update", HASH)));
        assertTrue(StudyFormat.isArmId(StudyFormat.armId("x".repeat(70), HASH)));
        assertFalse(StudyFormat.isArmId("1"), "format 3's arm directories");
        assertFalse(StudyFormat.isArmId("constant-0123456789AB"), "upper-case hexadecimal");
        assertFalse(StudyFormat.isArmId("../x-0123456789ab"));
        assertFalse(StudyFormat.isArmId(".x-0123456789ab"));
    }
}
