package settle.reports.format;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.StreamWriteFeature;
import com.fasterxml.jackson.core.util.DefaultIndenter;
import com.fasterxml.jackson.core.util.DefaultPrettyPrinter;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;

/**
 * How settle writes its JSON files: keys in the order written, two-space indentation, arrays of numbers on one line,
 * every double in its shortest round-trip form ({@link NumberText}, the same on any JDK), and JSON's null for a value
 * that is not finite (NaN means "does not apply" in the engine).
 */
public final class JsonOut {

    /** Doubles through Schubfach ({@link NumberText}) instead of the JDK's {@code Double.toString}. */
    private static final JsonFactory FACTORY = JsonFactory.builder()
            .enable(StreamWriteFeature.USE_FAST_DOUBLE_WRITER).build();

    private JsonOut() {
    }

    /** Writes one JSON document. */
    @FunctionalInterface
    public interface Body {
        /** @param g the generator, positioned before the document's value */
        void write(JsonGenerator g) throws IOException;
    }

    /** @return the UTF-8 bytes of the document, ending with a newline */
    public static byte[] document(Body body) {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream(1 << 14);
        try (JsonGenerator g = FACTORY.createGenerator(bytes)) {
            g.setPrettyPrinter(new DefaultPrettyPrinter().withObjectIndenter(new DefaultIndenter("  ", "\n")));
            body.write(g);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        bytes.write('\n');
        return bytes.toByteArray();
    }

    /** @return the document on one line, without the pretty printer (for a summary printed on a terminal) */
    public static String line(Body body) {
        java.io.StringWriter text = new java.io.StringWriter();
        try (JsonGenerator g = FACTORY.createGenerator(text)) {
            body.write(g);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return text.toString();
    }

    /** Writes {@code "key": value}, null when not finite. */
    public static void number(JsonGenerator g, String key, double value) throws IOException {
        g.writeFieldName(key);
        number(g, value);
    }

    /** Writes a value, null when not finite. */
    public static void number(JsonGenerator g, double value) throws IOException {
        if (Double.isFinite(value)) {
            g.writeNumber(value);
        } else {
            g.writeNull();
        }
    }

    /** Writes {@code "key": [values]} (null for a null array; null for each value that is not finite). */
    public static void array(JsonGenerator g, String key, double[] values) throws IOException {
        g.writeFieldName(key);
        if (values == null) {
            g.writeNull();
            return;
        }
        g.writeStartArray();
        for (double v : values) {
            number(g, v);
        }
        g.writeEndArray();
    }

    /** Writes {@code "key": [values]} of whole numbers (null for a null array). */
    public static void array(JsonGenerator g, String key, long[] values) throws IOException {
        g.writeFieldName(key);
        if (values == null) {
            g.writeNull();
            return;
        }
        g.writeStartArray();
        for (long v : values) {
            g.writeNumber(v);
        }
        g.writeEndArray();
    }

    /** Writes {@code "key": [strings]}. */
    public static void strings(JsonGenerator g, String key, java.util.List<String> values) throws IOException {
        g.writeArrayFieldStart(key);
        for (String v : values) {
            g.writeString(v);
        }
        g.writeEndArray();
    }

    /** Writes {@code "key": "text"}, or null for a null text. */
    public static void text(JsonGenerator g, String key, String value) throws IOException {
        if (value == null) {
            g.writeNullField(key);
        } else {
            g.writeStringField(key, value);
        }
    }

}
