package wayward.http;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import io.netty.buffer.Unpooled;
import io.netty.channel.ChannelHandlerContext;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.HttpResponseStatus;
import java.io.IOException;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.format.DateTimeFormatter;
import java.time.format.DateTimeParseException;
import java.util.List;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.secret.LogText;

/**
 * {@code GET /api/mutes} (the mutes in force), {@code POST /api/mutes} (mute a zone or a camera) and
 * {@code POST /api/mutes/end} (end one early). The body is one JSON object: {@code camera}, optional {@code zone},
 * for a mute exactly one of {@code minutes} or {@code until} (ISO-8601 instant), and optional {@code reason}. A
 * body that is not such an object answers 400; a request the mutes refuse (unknown camera or zone, an end in the
 * past or beyond {@code max_mute_hours}, nothing to end) answers 422; both in one line of plain text.
 */
public final class MuteRequests {
    private static final Logger LOG = LoggerFactory.getLogger(MuteRequests.class);
    private static final JsonFactory JSON = new JsonFactory();

    private final StatusSource service;
    private final Clock clock;

    MuteRequests(StatusSource service, Clock clock) {
        this.service = service;
        this.clock = clock;
    }

    /** What a request body asked for. */
    private record Asked(String camera, String zone, Double minutes, String until, String reason) {
    }

    void list(ChannelHandlerContext ctx, FullHttpRequest req) {
        MuteControl m = service.muteControl();
        Replies.json(ctx, req, HttpResponseStatus.OK, write(g -> {
            g.writeArrayFieldStart("mutes");
            for (MuteState s : m == null ? List.<MuteState>of() : m.mutes()) {
                state(g, s);
            }
            g.writeEndArray();
        }));
    }

    /** POST /api/mutes (start) or /api/mutes/end; {@code by} is the token's name. */
    void change(ChannelHandlerContext ctx, FullHttpRequest req, boolean start, String by) {
        MuteControl m = service.muteControl();
        if (m == null) {
            Replies.text(ctx, req, HttpResponseStatus.NOT_FOUND, "this service keeps no mutes\n", false);
            return;
        }
        String body = req.content().toString(StandardCharsets.UTF_8);
        // the request's line and headers, for the reply: the request itself is released when this returns
        FullHttpRequest head = req.replace(Unpooled.EMPTY_BUFFER);
        // a change writes the mutes file and waits for the disk: not on the event loop, which serves the others
        m.later(() -> changeNow(ctx, head, m, start, body, by));
    }

    private void changeNow(ChannelHandlerContext ctx, FullHttpRequest head, MuteControl m, boolean start, String body,
            String by) {
        try {
            MuteState s = apply(m, start, body, by, clock);
            Replies.json(ctx, head, start ? HttpResponseStatus.CREATED : HttpResponseStatus.OK, write(g -> {
                g.writeFieldName("mute");
                state(g, s);
                g.writeBooleanField("ended", !start);
            }));
        } catch (IllegalArgumentException bad) {
            Replies.text(ctx, head, HttpResponseStatus.BAD_REQUEST, bad.getMessage() + "\n", false);
        } catch (MuteControl.Refused r) {
            LOG.info("status server: {} refused: {}", start ? "mute" : "end of a mute", LogText.clean(r.getMessage()));
            Replies.text(ctx, head, HttpResponseStatus.UNPROCESSABLE_ENTITY, r.getMessage() + "\n", false);
        } catch (RuntimeException e) {
            LOG.error("status server: {} failed: {}", start ? "mute" : "end of a mute", LogText.clean(e.toString()));
            Replies.text(ctx, head, HttpResponseStatus.INTERNAL_SERVER_ERROR, "internal error\n", true);
        }
    }

    /**
     * Carries out a request's body (the same JSON over HTTP and MQTT): a mute ({@code start}) or its early end.
     *
     * @throws IllegalArgumentException when the body is not such an object (HTTP 400), saying why in one line
     * @throws MuteControl.Refused      when the mutes refuse it (HTTP 422)
     */
    public static MuteState apply(MuteControl m, boolean start, String body, String by, Clock clock)
            throws MuteControl.Refused {
        Asked a = parse(body);
        if (start) {
            return m.mute(a.camera(), a.zone(), until(a, m.longest(), clock), by, a.reason());
        }
        return m.unmute(a.camera(), a.zone(), by, a.reason());
    }

    /** The end a mute asked for: {@code until}, or now + {@code minutes}. */
    private static Instant until(Asked a, Duration longest, Clock clock) throws MuteControl.Refused {
        if (a.minutes() == null && a.until() == null) {
            throw new MuteControl.Refused("a mute needs its end: \"minutes\" (at most " + longest.toMinutes()
                    + ") or \"until\" (an ISO-8601 instant); a mute always ends by itself");
        }
        if (a.minutes() != null) {
            if (!(a.minutes() > 0) || a.minutes() > longest.toMinutes()) {
                throw new MuteControl.Refused("minutes " + a.minutes() + ": expected more than 0 and at most "
                        + longest.toMinutes() + " (max_mute_hours)");
            }
            return clock.instant().plusMillis(Math.round(a.minutes() * 60_000));
        }
        try {
            return Instant.parse(a.until());
        } catch (DateTimeParseException e) {
            throw new MuteControl.Refused("until \"" + LogText.clean(a.until()) + "\": expected an ISO-8601 instant "
                    + "such as 2026-12-03T18:00:00Z");
        }
    }

    /** The body's object; throws IllegalArgumentException (400) with a one-line reason. */
    static Asked parse(String body) {
        String camera = null;
        String zone = null;
        Double minutes = null;
        String until = null;
        String reason = null;
        try (JsonParser p = JSON.createParser(body)) {
            if (p.nextToken() != JsonToken.START_OBJECT) {
                throw new IllegalArgumentException("expected a JSON object such as {\"camera\": \"gate-in\", "
                        + "\"zone\": \"lane-2\", \"minutes\": 30, \"reason\": \"sweeper\"}");
            }
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String name = p.currentName();
                JsonToken v = p.nextToken();
                switch (name) {
                    case "camera" -> camera = text(p, v, name);
                    case "zone" -> zone = v == JsonToken.VALUE_NULL ? null : text(p, v, name);
                    case "until" -> until = text(p, v, name);
                    case "reason" -> reason = text(p, v, name);
                    case "minutes" -> {
                        if (v == null || !v.isNumeric()) {
                            throw new IllegalArgumentException("\"minutes\": expected a number");
                        }
                        minutes = p.getDoubleValue();
                    }
                    default -> throw new IllegalArgumentException("unknown field \"" + LogText.clean(name)
                            + "\" (expected camera, zone, minutes, until, reason)");
                }
            }
            if (p.currentToken() != JsonToken.END_OBJECT || p.nextToken() != null) {
                throw new IllegalArgumentException("expected one JSON object and nothing after it");
            }
        } catch (IOException e) {
            throw new IllegalArgumentException("malformed JSON: " + LogText.clean(e instanceof com.fasterxml.jackson.core.JsonProcessingException j ? j.getOriginalMessage() : e.getMessage()));
        }
        if (camera == null) {
            throw new IllegalArgumentException("\"camera\" is missing (expected a camera id)");
        }
        if (minutes != null && until != null) {
            throw new IllegalArgumentException("give \"minutes\" or \"until\", not both");
        }
        return new Asked(camera, zone, minutes, until, reason);
    }

    private static String text(JsonParser p, JsonToken v, String name) throws IOException {
        if (v != JsonToken.VALUE_STRING) {
            throw new IllegalArgumentException("\"" + name + "\": expected a string");
        }
        return p.getText();
    }

    private interface Fields {
        void write(JsonGenerator g) throws IOException;
    }

    private static String write(Fields f) {
        StringWriter out = new StringWriter();
        try (JsonGenerator g = JSON.createGenerator(out)) {
            g.writeStartObject();
            f.write(g);
            g.writeEndObject();
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
        return out + "\n";
    }

    /** One mute as JSON (also in /api/cameras). */
    static void state(JsonGenerator g, MuteState s) throws IOException {
        g.writeStartObject();
        fields(g, s);
        g.writeEndObject();
    }

    /** A mute's fields, inside an object the caller opened (also the service's mutes file). */
    public static void fields(JsonGenerator g, MuteState s) throws IOException {
        g.writeStringField("camera", s.camera());
        if (s.zone() != null) {
            g.writeStringField("zone", s.zone());
        }
        g.writeStringField("since", DateTimeFormatter.ISO_INSTANT.format(s.since()));
        g.writeStringField("until", DateTimeFormatter.ISO_INSTANT.format(s.until()));
        g.writeStringField("by", s.by());
        g.writeStringField("reason", s.reason());
    }
}
