package org.switchfit.report;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.core.json.JsonReadFeature;
import com.fasterxml.jackson.core.util.DefaultIndenter;
import com.fasterxml.jackson.core.util.DefaultPrettyPrinter;
import com.fasterxml.jackson.databind.DeserializationContext;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.MapperFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.SerializerProvider;
import com.fasterxml.jackson.databind.deser.std.StdDeserializer;
import com.fasterxml.jackson.databind.json.JsonMapper;
import com.fasterxml.jackson.databind.module.SimpleModule;
import com.fasterxml.jackson.databind.ser.std.StdSerializer;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.Arrays;
import org.switchfit.util.AtomicFiles;

/**
 * The JSON conventions of our result files, as one configured Jackson {@link ObjectMapper}.
 *
 * <ul>
 *   <li>Pretty-printed with two-space indentation and "\n" line ends on every platform; arrays of numbers on one
 *       line.</li>
 *   <li>Stable key order: object properties alphabetically (unless a class fixes its own order with
 *       {@code @JsonPropertyOrder}), map entries sorted by key.</li>
 *   <li>Finite doubles are written in Java's round-trip form ({@link Double#toString(double)}), so reading gives
 *       back the identical bits.</li>
 *   <li><b>Non-finite numbers:</b> JSON has no NaN or infinity, so NaN, +Infinity and -Infinity in {@code double},
 *       {@code float}, {@code Double}, {@code Float} and {@code double[]} values are written as {@code null}.
 *       Reading {@code null} into a {@code double} or a {@code double[]} element gives NaN (the sign of an infinity
 *       is not kept); into a boxed {@code Double} it gives null, as Jackson does. A reader in another language
 *       should treat null in a numeric field as "not a finite number". For files written by other tools, the
 *       non-standard tokens {@code NaN}, {@code Infinity} and {@code -Infinity} are accepted when reading.</li>
 *   <li>Unknown properties fail the read, so a result file from an incompatible version is not half-read.</li>
 * </ul>
 *
 * <p>The mapper is thread-safe once built; {@link #mapper()} returns a shared instance, which callers must not
 * reconfigure (use {@link #newMapper()} to get a private copy).
 */
public final class Json {
    private Json() {
    }

    private static final ObjectMapper SHARED = newMapper();

    /** The shared, configured mapper. Do not reconfigure it. */
    public static ObjectMapper mapper() {
        return SHARED;
    }

    /** A new mapper with the conventions above, for callers that need to add their own modules. */
    public static ObjectMapper newMapper() {
        SimpleModule m = new SimpleModule("switchfit-non-finite");
        m.addSerializer(Double.class, new DoubleSer());
        m.addSerializer(double.class, new DoubleSer());
        m.addSerializer(Float.class, new FloatSer());
        m.addSerializer(float.class, new FloatSer());
        m.addSerializer(double[].class, new DoubleArraySer());
        m.addDeserializer(double.class, new PrimitiveDoubleDeser());
        m.addDeserializer(double[].class, new DoubleArrayDeser());
        DefaultPrettyPrinter pp = new DefaultPrettyPrinter().withObjectIndenter(new DefaultIndenter("  ", "\n"));
        return JsonMapper.builder()
                .enable(SerializationFeature.INDENT_OUTPUT)
                .enable(SerializationFeature.ORDER_MAP_ENTRIES_BY_KEYS)
                .enable(MapperFeature.SORT_PROPERTIES_ALPHABETICALLY)
                .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
                .enable(JsonReadFeature.ALLOW_NON_NUMERIC_NUMBERS)
                .defaultPrettyPrinter(pp)
                .addModule(m)
                .build();
    }

    /** {@code value} as pretty JSON text, ending in a newline. */
    public static String toJson(Object value) {
        try {
            return SHARED.writeValueAsString(value) + "\n";
        } catch (JsonProcessingException e) {
            throw new IllegalArgumentException("cannot write " + value.getClass().getName() + " as JSON: "
                    + e.getOriginalMessage(), e);
        }
    }

    /** Writes {@code value} as pretty JSON to {@code file} atomically (UTF-8), creating parent directories. */
    public static void write(Path file, Object value) {
        AtomicFiles.writeString(file, toJson(value));
    }

    /**
     * Reads {@code file} as a {@code type}.
     *
     * @throws UncheckedIOException     if the file cannot be read
     * @throws JsonReadException        if it is not valid JSON for the type (message names the file, line and column)
     */
    public static <T> T read(Path file, Class<T> type) {
        try {
            return SHARED.readValue(file.toFile(), type);
        } catch (JsonProcessingException e) {
            throw new JsonReadException(file, e);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + file + ": " + e.getMessage(), e);
        }
    }

    /** JSON that does not match the expected structure; carries the location Jackson reported. */
    public static final class JsonReadException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        JsonReadException(Path file, JsonProcessingException e) {
            super(file + (e.getLocation() == null ? "" : ", line " + e.getLocation().getLineNr() + ", column "
                    + e.getLocation().getColumnNr()) + ": " + withoutJavaTypes(e.getOriginalMessage()), e);
        }

        /** A user reads JSON, not our classes: {@code `org.switchfit...Stored`} becomes "the expected value". */
        static String withoutJavaTypes(String message) {
            if (message == null) {
                return "";
            }
            return message.replaceAll(" \\(token `JsonToken\\.[A-Z_]+`\\)", "")
                    .replaceAll("value of type `[\\w.$<>, ]+`", "the expected value")
                    .replaceAll("`[a-z][\\w]*(\\.[\\w$]+)+`", "the expected value");
        }
    }

    private static final class DoubleSer extends StdSerializer<Double> {
        private static final long serialVersionUID = 1L;

        DoubleSer() {
            super(Double.class);
        }

        @Override
        public void serialize(Double v, JsonGenerator g, SerializerProvider p) throws IOException {
            if (Double.isFinite(v)) {
                g.writeNumber(v.doubleValue());
            } else {
                g.writeNull();
            }
        }
    }

    private static final class FloatSer extends StdSerializer<Float> {
        private static final long serialVersionUID = 1L;

        FloatSer() {
            super(Float.class);
        }

        @Override
        public void serialize(Float v, JsonGenerator g, SerializerProvider p) throws IOException {
            if (Float.isFinite(v)) {
                g.writeNumber(v.floatValue());
            } else {
                g.writeNull();
            }
        }
    }

    private static final class DoubleArraySer extends StdSerializer<double[]> {
        private static final long serialVersionUID = 1L;

        DoubleArraySer() {
            super(double[].class);
        }

        @Override
        public void serialize(double[] a, JsonGenerator g, SerializerProvider p) throws IOException {
            g.writeStartArray(a, a.length);
            for (double v : a) {
                if (Double.isFinite(v)) {
                    g.writeNumber(v);
                } else {
                    g.writeNull();
                }
            }
            g.writeEndArray();
        }
    }

    private static double number(JsonParser p, DeserializationContext c) throws IOException {
        JsonToken t = p.currentToken();
        if (t == JsonToken.VALUE_NUMBER_FLOAT || t == JsonToken.VALUE_NUMBER_INT) {
            return p.getDoubleValue();
        }
        if (t == JsonToken.VALUE_NULL) {
            return Double.NaN;
        }
        return (Double) c.handleUnexpectedToken(double.class, p);
    }

    private static final class PrimitiveDoubleDeser extends StdDeserializer<Double> {
        private static final long serialVersionUID = 1L;

        PrimitiveDoubleDeser() {
            super(double.class);
        }

        @Override
        public Double deserialize(JsonParser p, DeserializationContext c) throws IOException {
            return number(p, c);
        }

        @Override
        public Double getNullValue(DeserializationContext c) {
            return Double.NaN;
        }
    }

    private static final class DoubleArrayDeser extends StdDeserializer<double[]> {
        private static final long serialVersionUID = 1L;

        DoubleArrayDeser() {
            super(double[].class);
        }

        @Override
        public double[] deserialize(JsonParser p, DeserializationContext c) throws IOException {
            if (!p.isExpectedStartArrayToken()) {
                return (double[]) c.handleUnexpectedToken(double[].class, p);
            }
            double[] out = new double[16];
            int n = 0;
            while (p.nextToken() != JsonToken.END_ARRAY) {
                if (n == out.length) {
                    out = Arrays.copyOf(out, 2 * n);
                }
                out[n++] = number(p, c);
            }
            return Arrays.copyOf(out, n);
        }
    }
}
