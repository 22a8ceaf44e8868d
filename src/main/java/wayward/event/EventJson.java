package wayward.event;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.time.format.DateTimeFormatter;

/**
 * The JSON form of an event phase: one object on one line (JSON Lines). Field names are the contract of the
 * event record; values that do not apply (NaN) are left out. Thread-safe; allocates per call (events are rare).
 */
public final class EventJson {
    private static final JsonFactory JSON = new JsonFactory();

    private EventJson() {
    }

    public static String toJson(Event e) {
        StringWriter out = new StringWriter(256);
        try (JsonGenerator g = JSON.createGenerator(out)) {
            g.writeStartObject();
            g.writeStringField("id", e.id());
            g.writeStringField("camera", e.camera());
            if (e.zone() != null) {
                g.writeStringField("zone", e.zone());
            }
            g.writeStringField("kind", e.kind().jsonName());
            g.writeStringField("phase", e.phase().jsonName());
            number(g, "stream_s", e.streamSeconds(), 1000);
            g.writeStringField("at", DateTimeFormatter.ISO_INSTANT.format(e.at()));
            number(g, "heading_deg", e.headingDeg(), 10);
            number(g, "speed", e.speed(), 100);
            number(g, "coverage", e.coverage(), 10000);
            number(g, "duration_s", e.durationSeconds(), 1000);
            if (e.clip() != null) {
                g.writeStringField("clip", e.clip());
            }
            if (e.snapshot() != null) {
                g.writeStringField("snapshot", e.snapshot());
            }
            g.writeEndObject();
        } catch (IOException ex) {
            throw new UncheckedIOException(ex);
        }
        return out.toString();
    }

    /** Writes a number rounded to 1/scale, or nothing for NaN. */
    private static void number(JsonGenerator g, String name, double value, double scale) throws IOException {
        if (!Double.isNaN(value) && !Double.isInfinite(value)) {
            g.writeNumberField(name, Math.round(value * scale) / scale);
        }
    }
}
