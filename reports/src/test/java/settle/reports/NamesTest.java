package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;
import settle.reports.text.Names;

/** How a name is shown: isolated only when it can reorder the sentence around it; controls always visible. */
class NamesTest {

    @Test
    void isolatesOnlyWhatCanReorderTheSentence() {
        assertEquals("cosine[rate=0.5]", Names.shown("cosine[rate=0.5]"), "left-to-right letters and punctuation");
        assertEquals("\u2068שלום\u2069", Names.shown("שלום"), "a right-to-left name is isolated");
        assertEquals("\u2068a⟨U+202E⟩b\u2069", Names.shown("a\u202Eb"), "an override is shown and isolated");
        assertEquals("tab␉name", Names.shown("tab\tname"), "controls are visible, no isolate needed");
    }
}
