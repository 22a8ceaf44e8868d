package wayward.event;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import java.io.IOException;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.time.Instant;
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
            Event.Mover m = e.mover();
            if (m != null) {
                g.writeNumberField("mover_width_px", m.widthPx());
                g.writeNumberField("mover_height_px", m.heightPx());
                g.writeNumberField("mover_samples", m.samples());
                g.writeArrayFieldStart("mover_path");
                double[] p = m.path();
                for (int i = 0; i + 1 < p.length; i += 2) {
                    g.writeStartArray();
                    g.writeNumber(Math.round(p[i] * 1000) / 1000.0);
                    g.writeNumber(Math.round(p[i + 1] * 1000) / 1000.0);
                    g.writeEndArray();
                }
                g.writeEndArray();
                number(g, "mover_speed_px_s", m.speedPxPerSecond(), 100);
                number(g, "mover_travel_px", m.travelPx(), 10);
            }
            if (e.clip() != null) {
                g.writeStringField("clip", e.clip());
            }
            if (e.snapshot() != null) {
                g.writeStringField("snapshot", e.snapshot());
            }
            if (e.endedBy() != null) {
                g.writeStringField("ended_by", e.endedBy());
            }
            g.writeEndObject();
        } catch (IOException ex) {
            throw new UncheckedIOException(ex);
        }
        return out.toString();
    }

    /**
     * Reads back an event phase written by {@link #toJson} (the outbox keeps phases in that form). Unknown
     * fields are ignored, so records written by a newer version still read.
     *
     * @throws IllegalArgumentException when the bytes are not such an object
     */
    public static Event parse(byte[] json) {
        String id = null, camera = null, zone = null, clip = null, snapshot = null, at = null, endedBy = null;
        EventKind kind = null;
        Event.Phase phase = null;
        double stream = Double.NaN, heading = Double.NaN, speed = Double.NaN, coverage = Double.NaN;
        double duration = Double.NaN;
        int moverWidth = -1, moverHeight = -1, moverSamples = -1;
        double moverSpeed = Double.NaN, moverTravel = Double.NaN;
        double[] moverPath = null;
        try (JsonParser p = JSON.createParser(json)) {
            if (p.nextToken() != JsonToken.START_OBJECT) {
                throw new IllegalArgumentException("not a JSON object");
            }
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String name = p.currentName();
                JsonToken t = p.nextToken();
                switch (name) {
                    case "id" -> id = p.getText();
                    case "camera" -> camera = p.getText();
                    case "zone" -> zone = p.getText();
                    case "kind" -> kind = kindOf(p.getText());
                    case "phase" -> phase = phaseOf(p.getText());
                    case "stream_s" -> stream = p.getDoubleValue();
                    case "at" -> at = p.getText();
                    case "heading_deg" -> heading = p.getDoubleValue();
                    case "speed" -> speed = p.getDoubleValue();
                    case "coverage" -> coverage = p.getDoubleValue();
                    case "duration_s" -> duration = p.getDoubleValue();
                    case "clip" -> clip = p.getText();
                    case "snapshot" -> snapshot = p.getText();
                    case "ended_by" -> endedBy = p.getText();
                    case "mover_width_px" -> moverWidth = p.getIntValue();
                    case "mover_height_px" -> moverHeight = p.getIntValue();
                    case "mover_samples" -> moverSamples = p.getIntValue();
                    case "mover_speed_px_s" -> moverSpeed = p.getDoubleValue();
                    case "mover_travel_px" -> moverTravel = p.getDoubleValue();
                    case "mover_path" -> moverPath = path(p);
                    default -> {
                        if (t.isStructStart()) {
                            p.skipChildren();
                        }
                    }
                }
            }
        } catch (IOException e) {
            throw new IllegalArgumentException("not valid JSON: " + e.getMessage());
        }
        if (at == null) {
            throw new IllegalArgumentException("no \"at\" field");
        }
        try {
            Event.Mover mover = moverPath == null ? null
                    : new Event.Mover(moverWidth, moverHeight, moverSamples, moverPath, moverSpeed, moverTravel);
            return new Event(id, camera, zone, kind, phase, stream, Instant.parse(at), heading, speed, coverage,
                    duration, clip, snapshot, mover, endedBy);
        } catch (java.time.format.DateTimeParseException e) {
            throw new IllegalArgumentException("\"at\" is not an ISO-8601 instant: " + at);
        }
    }

    /** A path [[x, y], …] at the parser's current START_ARRAY. */
    private static double[] path(JsonParser p) throws IOException {
        if (p.currentToken() != JsonToken.START_ARRAY) {
            throw new IllegalArgumentException("mover_path is not an array");
        }
        java.util.List<Double> xy = new java.util.ArrayList<>();
        while (p.nextToken() == JsonToken.START_ARRAY) {
            for (int k = 0; k < 2; k++) {
                if (!p.nextToken().isNumeric()) {
                    throw new IllegalArgumentException("mover_path: expected [x, y] number pairs");
                }
                xy.add(p.getDoubleValue());
            }
            if (p.nextToken() != JsonToken.END_ARRAY) {
                throw new IllegalArgumentException("mover_path: expected [x, y] number pairs");
            }
        }
        double[] out = new double[xy.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = xy.get(i);
        }
        return out;
    }

    private static EventKind kindOf(String name) {
        for (EventKind k : EventKind.values()) {
            if (k.jsonName().equals(name)) {
                return k;
            }
        }
        throw new IllegalArgumentException("unknown kind " + name);
    }

    private static Event.Phase phaseOf(String name) {
        for (Event.Phase ph : Event.Phase.values()) {
            if (ph.jsonName().equals(name)) {
                return ph;
            }
        }
        throw new IllegalArgumentException("unknown phase " + name);
    }

    /** Writes the fields of one JSON object. */
    public interface Fields {
        void write(JsonGenerator g) throws IOException;
    }

    /** One JSON object on one line, its fields written by {@code f} (status payloads, API answers). */
    public static String object(Fields f) {
        StringWriter out = new StringWriter(256);
        try (JsonGenerator g = JSON.createGenerator(out)) {
            g.writeStartObject();
            f.write(g);
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
