package settle.experiments.study;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.util.DefaultIndenter;
import com.fasterxml.jackson.core.util.DefaultPrettyPrinter;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;

/**
 * Small helpers for writing the study directory's JSON files: keys in the order written, two-space
 * indentation, arrays of numbers on one line, numbers in Java's shortest round-trip form, and JSON's null
 * for a value that is not finite (NaN means "does not apply" in the engine).
 */
public final class Json {

    private static final JsonFactory FACTORY = new JsonFactory();

    private Json() {
    }

    /** Writes one JSON document. */
    @FunctionalInterface
    public interface Body {
        void write(JsonGenerator g) throws IOException;
    }

    /** @return the UTF-8 bytes of the document, ending with a newline */
    public static byte[] document(Body body) {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream(1 << 14);
        try (JsonGenerator g = FACTORY.createGenerator(bytes)) {
            DefaultPrettyPrinter pretty = new DefaultPrettyPrinter()
                    .withObjectIndenter(new DefaultIndenter("  ", "\n"));
            g.setPrettyPrinter(pretty);
            body.write(g);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        bytes.write('\n');
        return bytes.toByteArray();
    }

    public static void number(JsonGenerator g, String key, double value) throws IOException {
        g.writeFieldName(key);
        number(g, value);
    }

    public static void number(JsonGenerator g, double value) throws IOException {
        if (Double.isFinite(value)) {
            g.writeNumber(value);
        } else {
            g.writeNull();
        }
    }

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

    /** A row-major matrix: {rows, columns, values}. */
    public static void matrix(JsonGenerator g, String key, int rows, int columns, double[] values) throws IOException {
        g.writeFieldName(key);
        if (values == null) {
            g.writeNull();
            return;
        }
        g.writeStartObject();
        g.writeNumberField("rows", rows);
        g.writeNumberField("columns", columns);
        array(g, "values", values);
        g.writeEndObject();
    }
}
