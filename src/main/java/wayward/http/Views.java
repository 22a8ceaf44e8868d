package wayward.http;

import static wayward.http.Replies.response;
import static wayward.http.Replies.send;
import static wayward.http.Replies.text;

import com.fasterxml.jackson.core.JsonGenerator;
import io.netty.buffer.Unpooled;
import io.netty.channel.ChannelHandlerContext;
import io.netty.handler.codec.http.DefaultFullHttpResponse;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.FullHttpResponse;
import io.netty.handler.codec.http.HttpHeaderNames;
import io.netty.handler.codec.http.HttpResponseStatus;
import io.netty.handler.codec.http.HttpVersion;
import io.netty.handler.codec.http.QueryStringDecoder;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import wayward.analysis.ZoneConfig;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.secret.Urls;
import wayward.analysis.CameraStatus;

/**
 * The views of the running service: health and readiness, the cameras and their zones, the recent events, the
 * live picture and page, and a drawn zone measured on the live flow.
 */
final class Views {
    private final StatusSource service;

    Views(StatusSource service) {
        this.service = service;
    }

    /** The camera with this id, or null. */
    CameraStatus camera(String id) {
        for (CameraStatus p : service.cameraStatus()) {
            if (p.id().equals(id)) {
                return p;
            }
        }
        return null;
    }

    /**
     * {@code /health} (always 200 while the process answers) and {@code /health/ready} (503 while the service is
     * still starting, a camera is lost or a delivery has stopped).
     */
    void health(ChannelHandlerContext ctx, FullHttpRequest req, boolean readiness) {
        List<String> lost = new ArrayList<>();
        for (CameraStatus p : service.cameraStatus()) {
            if (!p.watching()) {
                lost.add(p.id());
            }
        }
        List<String> stopped = new ArrayList<>();
        for (wayward.delivery.Courier c : service.bus().couriers()) {
            if (c.stoppedBy() != null) {
                stopped.add(c.destination().name());
            }
        }
        boolean ready = !service.starting() && lost.isEmpty() && stopped.isEmpty();
        String body = EventJson.object(g -> {
            g.writeBooleanField("alive", true);
            g.writeBooleanField("ready", ready);
            g.writeArrayFieldStart("cameras_lost");
            for (String d : lost) {
                g.writeString(d);
            }
            g.writeEndArray();
            g.writeArrayFieldStart("delivery_stopped");
            for (String d : stopped) {
                g.writeString(d);
            }
            g.writeEndArray();
        });
        Replies.json(ctx, req, readiness && !ready ? HttpResponseStatus.SERVICE_UNAVAILABLE : HttpResponseStatus.OK,
                body);
    }

    /** {@code /metrics}: Prometheus text format. */
    void metrics(ChannelHandlerContext ctx, FullHttpRequest req) {
        send(ctx, req, response(HttpResponseStatus.OK, MetricsText.of(service),
                "text/plain; version=0.0.4; charset=utf-8"));
    }

    private static void number(JsonGenerator g, String name, double v) throws IOException {
        if (Double.isNaN(v)) {
            g.writeNullField(name);
        } else {
            g.writeNumberField(name, Math.round(v * 10000) / 10000.0);
        }
    }

    /** A camera's health in the one pair of words used everywhere (events, MQTT, pages): watching or lost. */
    static String state(CameraStatus p) {
        return p.watching() ? "watching" : "lost";
    }

    /** {@code /api/cameras}: each camera's source (masked), counters and zones with their latest readings. */
    void cameras(ChannelHandlerContext ctx, FullHttpRequest req) {
        Replies.json(ctx, req, HttpResponseStatus.OK, EventJson.object(this::writeCameras));
    }

    private void writeCameras(JsonGenerator g) throws IOException {
        MuteControl control = service.muteControl();
        List<MuteState> muted = control == null ? List.of() : control.mutes();
        g.writeArrayFieldStart("cameras");
        for (CameraStatus p : service.cameraStatus()) {
            g.writeStartObject();
            g.writeStringField("id", p.id());
            mute(g, muted, p.id(), null);
            g.writeStringField("source", Urls.mask(p.config().source()));
            g.writeStringField("state", state(p));
            // the tamper conditions open now: a start raised, its end not yet (the site page's "tampered")
            g.writeArrayFieldStart("conditions");
            for (String c : p.conditions()) {
                g.writeString(c);
            }
            g.writeEndArray();
            g.writeNumberField("frames_in", p.framesIn());
            g.writeNumberField("frames_analysed", p.analysedFrames());
            g.writeNumberField("frames_dropped", p.droppedFrames());
            g.writeNumberField("decode_errors", p.decodeErrors());
            g.writeNumberField("reconnects", p.reconnects());
            number(g, "stream_s", p.streamSeconds());
            g.writeArrayFieldStart("streams");
            for (CameraStatus.StreamState st : p.streams()) {
                g.writeStartObject();
                g.writeStringField("stream", st.key());
                g.writeStringField("address", Urls.mask(st.address()));
                g.writeBooleanField("decoded", st.decoded());
                if (st.width() > 0) {
                    g.writeNumberField("width", st.width());
                    g.writeNumberField("height", st.height());
                } else {
                    g.writeNullField("width");
                    g.writeNullField("height");
                }
                g.writeNumberField("frames_in", st.frames());
                if (st.packets() >= 0) {
                    g.writeNumberField("packets_in", st.packets());
                }
                g.writeNumberField("reconnects", st.reconnects());
                g.writeStringField("state", st.watching() ? "watching" : "lost");
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeArrayFieldStart("zones");
            List<ZoneConfig> zones = p.config().zones();
            for (int z = 0; z < zones.size(); z++) {
                ZoneConfig zc = zones.get(z);
                g.writeStartObject();
                g.writeStringField("id", zc.id());
                mute(g, muted, p.id(), zc.id());
                g.writeArrayFieldStart("polygon");
                double[] xs = zc.xs();
                double[] ys = zc.ys();
                for (int i = 0; i < xs.length; i++) {
                    g.writeArray(new double[] {xs[i], ys[i]}, 0, 2);
                }
                g.writeEndArray();
                double h = p.zoneHeading(z);
                if (!Double.isNaN(h)) {
                    g.writeNumberField("heading_deg", Math.round(h * 10) / 10.0);
                    g.writeNumberField("tolerance_deg", zc.toleranceDeg());
                }
                g.writeStringField("heading_source", zc.hasHeading() ? "configured" : !zc.learnsHeading() ? "none"
                        : p.zoneLearning(z) ? "learning" : "learned");
                g.writeNumberField("onset_level", zc.rule().onsetLevel());
                g.writeNumberField("release_level", zc.rule().releaseLevel());
                number(g, "moving_share", p.zoneMovingShare(z));
                number(g, "against_share", p.zoneAgainstShare(z));
                g.writeNumberField("events", p.zoneEvents(z));
                if (zc.hasHours()) {
                    // the schedule is a function of the time: read from the config, as the analysis thread does
                    java.time.Instant now = java.time.Instant.now();
                    java.time.Instant next = zc.hours().nextChange(now);
                    g.writeObjectFieldStart("hours");
                    g.writeBooleanField("in_hours", zc.hours().on(now));
                    if (next == null) {
                        g.writeNullField("next_change");
                    } else {
                        g.writeStringField("next_change", java.time.format.DateTimeFormatter.ISO_INSTANT.format(next));
                    }
                    g.writeStringField("schedule", zc.hours().toString());
                    g.writeEndObject();
                }
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        }
        g.writeEndArray();
        Instances in = service.instances();
        if (in != null) {
            writeInstances(g, in);
        }
    }

    /** {@code "muted": {...}} when the camera (zone null) or the zone is muted. */
    private static void mute(JsonGenerator g, List<MuteState> muted, String camera, String zone) throws IOException {
        for (MuteState s : muted) {
            if (s.camera().equals(camera) && java.util.Objects.equals(s.zone(), zone)) {
                g.writeFieldName("muted");
                MuteRequests.state(g, s);
                return;
            }
        }
    }

    /** Who watches which camera when instances share the config, and why ({@code /api/cameras}, "instances"). */
    private static void writeInstances(JsonGenerator g, Instances in) throws IOException {
        g.writeObjectFieldStart("instances");
        g.writeStringField("self", in.self());
        g.writeStringField("membership", in.membership());
        g.writeBooleanField("broker_connected", in.brokerConnected());
        g.writeNumberField("moves", in.moves());
        g.writeArrayFieldStart("instances");
        for (Instances.Peer p : in.instances()) {
            g.writeStartObject();
            g.writeStringField("name", p.name());
            if (p.online() == null) {
                g.writeNullField("online");
            } else {
                g.writeBooleanField("online", p.online());
            }
            if (p.since() != null) {
                g.writeStringField("since", java.time.format.DateTimeFormatter.ISO_INSTANT.format(p.since()));
            }
            g.writeEndObject();
        }
        g.writeEndArray();
        g.writeArrayFieldStart("cameras");
        for (Instances.Assignment a : in.cameras()) {
            g.writeStartObject();
            g.writeStringField("camera", a.camera());
            g.writeStringField("instance", a.instance());
            g.writeStringField("reason", a.reason());
            g.writeEndObject();
        }
        g.writeEndArray();
        g.writeEndObject();
    }

    /** {@code /api/events?limit=N}: the latest event phases, newest last (N from 1 to 200, 50 by default). */
    void events(ChannelHandlerContext ctx, FullHttpRequest req, QueryStringDecoder q) {
        Integer limit = Replies.whole(ctx, req, q, "limit", 50, 1, 200);
        if (limit == null) {
            return;
        }
        StringBuilder b = new StringBuilder("{\"events\":[");
        List<Event> last = service.recentEvents().last(limit);
        for (int i = 0; i < last.size(); i++) {
            b.append(i == 0 ? "" : ",").append(EventJson.toJson(last.get(i)));
        }
        b.append("]}\n");
        send(ctx, req, response(HttpResponseStatus.OK, b.toString(), Replies.JSON));
    }

    /** A page or script from the jar (a fixed set of names, nothing from the file system). */
    static void page(ChannelHandlerContext ctx, FullHttpRequest req, String name) throws IOException {
        try (java.io.InputStream in = Views.class.getResourceAsStream("/wayward/http/" + name)) {
            if (in == null) {
                text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such page\n", false);
                return;
            }
            String type = name.endsWith(".js") ? "text/javascript; charset=utf-8" : "text/html; charset=utf-8";
            send(ctx, req, response(HttpResponseStatus.OK, new String(in.readAllBytes(), StandardCharsets.UTF_8), type));
        }
    }

    /** {@code /openapi.json}: the OpenAPI 3.1 description of the JSON answers, from the jar (no site data). */
    static void openapi(ChannelHandlerContext ctx, FullHttpRequest req) throws IOException {
        try (java.io.InputStream in = Views.class.getResourceAsStream("/openapi.json")) {
            if (in == null) {
                text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such page\n", false);
                return;
            }
            send(ctx, req, response(HttpResponseStatus.OK, new String(in.readAllBytes(), StandardCharsets.UTF_8),
                    Replies.JSON));
        }
    }

    /** {@code /view/<camera>}: the live view page of a camera that exists. */
    void view(ChannelHandlerContext ctx, FullHttpRequest req, String id) throws IOException {
        if (camera(id) == null) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such camera\n", false);
        } else {
            page(ctx, req, "view.html");
        }
    }

    /** {@code /live/<camera>.jpg}: the latest analysed picture with its flow drawn; 503 until there is one. */
    void picture(ChannelHandlerContext ctx, FullHttpRequest req, String id) throws IOException {
        CameraStatus p = camera(id);
        if (p == null) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such camera\n", false);
            return;
        }
        p.live().want();
        byte[] jpg = LiveStream.jpeg(p);
        if (jpg == null) {
            FullHttpResponse r = response(HttpResponseStatus.SERVICE_UNAVAILABLE, "no picture yet; try again\n",
                    "text/plain");
            r.headers().set(HttpHeaderNames.RETRY_AFTER, "1");
            send(ctx, req, r);
            return;
        }
        FullHttpResponse r = new DefaultFullHttpResponse(HttpVersion.HTTP_1_1, HttpResponseStatus.OK,
                Unpooled.wrappedBuffer(jpg));
        r.headers().set(HttpHeaderNames.CONTENT_TYPE, "image/jpeg");
        r.headers().set(HttpHeaderNames.CONTENT_LENGTH, jpg.length);
        r.headers().set(HttpHeaderNames.CACHE_CONTROL, "no-store");
        send(ctx, req, r);
    }

    /** {@code /api/measure}: moving and against share of a drawn zone on the camera's latest flow. */
    void measure(ChannelHandlerContext ctx, FullHttpRequest req, QueryStringDecoder q) {
        CameraStatus p = camera(Replies.first(q, "camera", ""));
        if (p == null) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such camera\n", false);
            return;
        }
        MeasureRequest m;
        try {
            m = MeasureRequest.parse(q);
        } catch (RuntimeException e) {
            text(ctx, req, HttpResponseStatus.BAD_REQUEST, MeasureRequest.USAGE + ": " + e.getMessage() + "\n", false);
            return;
        }
        p.live().want();
        wayward.zone.ZoneReading r = p.live().measure(m.xs(), m.ys(), m.headingDeg(), m.toleranceDeg(), ZoneConfig.DEFAULT_MIN_SPEED,
                ZoneConfig.DEFAULT_MIN_CONFIDENCE, p.config().removeCameraMotion());
        String body = EventJson.object(g -> {
            number(g, "moving_share", r == null ? Double.NaN : r.movingShare);
            number(g, "against_share", r == null ? Double.NaN : r.againstShare);
        });
        Replies.json(ctx, req, HttpResponseStatus.OK, body);
    }
}
