package wayward.http;

import com.fasterxml.jackson.core.JsonGenerator;
import io.netty.buffer.ByteBuf;
import io.netty.buffer.Unpooled;
import io.netty.channel.ChannelFuture;
import io.netty.channel.ChannelFutureListener;
import io.netty.channel.ChannelHandlerContext;
import io.netty.channel.DefaultFileRegion;
import io.netty.channel.SimpleChannelInboundHandler;
import io.netty.handler.codec.TooLongFrameException;
import io.netty.handler.codec.http.DefaultFullHttpResponse;
import io.netty.handler.codec.http.DefaultHttpResponse;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.FullHttpResponse;
import io.netty.handler.codec.http.HttpHeaderNames;
import io.netty.handler.codec.http.HttpHeaderValues;
import io.netty.handler.codec.http.HttpMethod;
import io.netty.handler.codec.http.HttpResponse;
import io.netty.handler.codec.http.HttpResponseStatus;
import io.netty.handler.codec.http.HttpUtil;
import io.netty.handler.codec.http.HttpVersion;
import io.netty.handler.codec.http.LastHttpContent;
import io.netty.handler.codec.http.QueryStringDecoder;
import io.netty.handler.timeout.IdleStateEvent;
import java.io.IOException;
import java.io.RandomAccessFile;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.config.ConfigPrinter;
import wayward.config.ZoneConfig;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.service.CameraPipeline;
import wayward.service.Service;

/**
 * Answers one connection's requests (GET and HEAD only). Routes: {@code /health}, {@code /health/ready},
 * {@code /metrics}, {@code /api/cameras}, {@code /api/events?limit=N}, {@code /api/clips}, {@code /clips/<path>}
 * (range requests). Every refusal is a short plain-text 4xx naming the reason.
 */
final class StatusHandler extends SimpleChannelInboundHandler<FullHttpRequest> {
    private static final Logger LOG = LoggerFactory.getLogger(StatusHandler.class);

    /** What all connections share. */
    record Shared(Service service, byte[] token) {
    }

    private final Shared shared;

    StatusHandler(Shared shared) {
        this.shared = shared;
    }

    @Override
    protected void channelRead0(ChannelHandlerContext ctx, FullHttpRequest req) {
        if (req.decoderResult().isFailure()) {
            Throwable why = req.decoderResult().cause();
            if (why instanceof TooLongFrameException) {
                String m = String.valueOf(why.getMessage());
                HttpResponseStatus s = m.contains("header") ? HttpResponseStatus.REQUEST_HEADER_FIELDS_TOO_LARGE
                        : HttpResponseStatus.REQUEST_URI_TOO_LONG;
                text(ctx, req, s, "request too large: " + m + "\n", true);
            } else {
                text(ctx, req, HttpResponseStatus.BAD_REQUEST, "malformed request\n", true);
            }
            return;
        }
        if (!req.method().equals(HttpMethod.GET) && !req.method().equals(HttpMethod.HEAD)) {
            FullHttpResponse r = response(HttpResponseStatus.METHOD_NOT_ALLOWED, "only GET and HEAD\n", "text/plain");
            r.headers().set(HttpHeaderNames.ALLOW, "GET, HEAD");
            send(ctx, req, r);
            return;
        }
        // ";" is part of a value (the polygon), not a separator
        QueryStringDecoder q = new QueryStringDecoder(req.uri(), StandardCharsets.UTF_8, true, 1024, true);
        String path = q.rawPath();
        try {
            if (path.equals("/health") || path.equals("/health/ready")) {
                health(ctx, req, path.endsWith("/ready"));
                return;
            }
            if (path.equals("/view.js")) {
                page(ctx, req, "view.js"); // the page's script holds no site data; the page itself needs the token
                return;
            }
            if (!authorised(req)) {
                FullHttpResponse r = response(HttpResponseStatus.UNAUTHORIZED,
                        "a bearer token is required (Authorization: Bearer …)\n", "text/plain");
                r.headers().set(HttpHeaderNames.WWW_AUTHENTICATE, "Bearer realm=\"wayward\"");
                send(ctx, req, r);
                return;
            }
            switch (path) {
                case "/" -> page(ctx, req, "index.html");
                case "/api/measure" -> measure(ctx, req, q);
                case "/metrics" -> send(ctx, req, response(HttpResponseStatus.OK, MetricsText.of(shared.service()),
                        "text/plain; version=0.0.4; charset=utf-8"));
                case "/api/cameras" -> json(ctx, req, this::cameras);
                case "/api/events" -> events(ctx, req, q);
                case "/api/clips" -> json(ctx, req, this::clips);
                default -> {
                    if (path.startsWith("/view/")) {
                        CameraPipeline p = camera(path.substring("/view/".length()));
                        if (p == null) {
                            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such camera\n", false);
                        } else {
                            page(ctx, req, "view.html");
                        }
                    } else if (path.startsWith("/live/") && path.endsWith(".jpg")) {
                        picture(ctx, req, path.substring(6, path.length() - 4));
                    } else if (path.startsWith("/live/") && path.endsWith(".mjpeg")) {
                        LiveStream.start(ctx, req, camera(path.substring(6, path.length() - 6)));
                    } else if (path.startsWith("/clips/")) {
                        clip(ctx, req, path.substring("/clips/".length()));
                    } else {
                        text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such page: " + shorten(path) + "\n", false);
                    }
                }
            }
        } catch (RuntimeException | IOException e) {
            LOG.error("status server: {} {} failed: {}", req.method(), shorten(path), e.toString());
            text(ctx, req, HttpResponseStatus.INTERNAL_SERVER_ERROR, "internal error\n", true);
        }
    }

    private static String shorten(String s) {
        return s.length() > 100 ? s.substring(0, 100) + "…" : s;
    }

    /**
     * The bearer token from the Authorization header, or from an {@code access_token} query parameter (RFC 6750
     * §2.3), which a browser's picture and page requests can carry.
     */
    private boolean authorised(FullHttpRequest req) {
        if (shared.token() == null) {
            return true;
        }
        String given = null;
        String h = req.headers().get(HttpHeaderNames.AUTHORIZATION);
        if (h != null && h.regionMatches(true, 0, "Bearer ", 0, 7)) {
            given = h.substring(7).trim();
        } else {
            List<String> q = new QueryStringDecoder(req.uri()).parameters().get("access_token");
            if (q != null && !q.isEmpty()) {
                given = q.get(0);
            }
        }
        return given != null && MessageDigest.isEqual(given.getBytes(StandardCharsets.UTF_8), shared.token());
    }

    private CameraPipeline camera(String id) {
        for (CameraPipeline p : shared.service().pipelines()) {
            if (p.id().equals(id)) {
                return p;
            }
        }
        return null;
    }

    /** A page or script from the jar (a fixed set of names, nothing from the file system). */
    private void page(ChannelHandlerContext ctx, FullHttpRequest req, String name) throws IOException {
        try (java.io.InputStream in = StatusHandler.class.getResourceAsStream("/wayward/http/" + name)) {
            if (in == null) {
                text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such page\n", false);
                return;
            }
            String type = name.endsWith(".js") ? "text/javascript; charset=utf-8" : "text/html; charset=utf-8";
            send(ctx, req, response(HttpResponseStatus.OK, new String(in.readAllBytes(), StandardCharsets.UTF_8), type));
        }
    }

    private void picture(ChannelHandlerContext ctx, FullHttpRequest req, String id) throws IOException {
        CameraPipeline p = camera(id);
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

    /** Coverage and against share of a drawn zone on the latest flow: camera, polygon=x,y;x,y;…, heading. */
    private void measure(ChannelHandlerContext ctx, FullHttpRequest req, QueryStringDecoder q) {
        CameraPipeline p = camera(first(q, "camera", ""));
        if (p == null) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such camera\n", false);
            return;
        }
        double[][] poly;
        double heading;
        double tolerance;
        try {
            String[] points = first(q, "polygon", "").split(";");
            if (points.length < 3 || points.length > 64) {
                throw new IllegalArgumentException("3 to 64 points");
            }
            poly = new double[2][points.length];
            for (int i = 0; i < points.length; i++) {
                String[] xy = points[i].split(",");
                poly[0][i] = Double.parseDouble(xy[0]);
                poly[1][i] = Double.parseDouble(xy[1]);
                if (xy.length != 2 || !(poly[0][i] >= 0 && poly[0][i] <= 1 && poly[1][i] >= 0 && poly[1][i] <= 1)) {
                    throw new IllegalArgumentException("points x,y from 0 to 1");
                }
            }
            String h = first(q, "heading", "");
            heading = h.isEmpty() ? Double.NaN : Double.parseDouble(h);
            if (!Double.isNaN(heading) && !(heading >= 0 && heading < 360)) {
                throw new IllegalArgumentException("heading from 0 up to 360");
            }
            tolerance = Double.parseDouble(first(q, "tolerance", Double.toString(ZoneConfig.DEFAULT_TOLERANCE_DEG)));
            if (!(tolerance >= 0 && tolerance <= 90)) {
                throw new IllegalArgumentException("tolerance from 0 to 90");
            }
        } catch (RuntimeException e) {
            text(ctx, req, HttpResponseStatus.BAD_REQUEST, "polygon=x,y;x,y;x,y (fractions), heading=deg, "
                    + "tolerance=deg: " + e.getMessage() + "\n", false);
            return;
        }
        p.live().want();
        double[] m = p.live().measure(poly[0], poly[1], heading, tolerance, ZoneConfig.DEFAULT_MIN_SPEED,
                ZoneConfig.DEFAULT_MIN_CONFIDENCE, p.config().removeCameraMotion());
        String body = EventJson.object(g -> {
            number(g, "coverage", m == null ? Double.NaN : m[0]);
            number(g, "against", m == null ? Double.NaN : m[1]);
        });
        send(ctx, req, response(HttpResponseStatus.OK, body + "\n", "application/json"));
    }

    private static String first(QueryStringDecoder q, String name, String fallback) {
        List<String> v = q.parameters().get(name);
        return v == null || v.isEmpty() ? fallback : v.get(0);
    }

    private void health(ChannelHandlerContext ctx, FullHttpRequest req, boolean readiness) {
        List<String> down = new ArrayList<>();
        for (CameraPipeline p : shared.service().pipelines()) {
            if (!p.delivering()) {
                down.add(p.id());
            }
        }
        String body = EventJson.object(g -> {
            g.writeBooleanField("alive", true);
            g.writeBooleanField("ready", down.isEmpty());
            g.writeArrayFieldStart("cameras_down");
            for (String d : down) {
                g.writeString(d);
            }
            g.writeEndArray();
        });
        HttpResponseStatus s = readiness && !down.isEmpty() ? HttpResponseStatus.SERVICE_UNAVAILABLE : HttpResponseStatus.OK;
        send(ctx, req, response(s, body + "\n", "application/json"));
    }

    private void json(ChannelHandlerContext ctx, FullHttpRequest req, EventJson.Fields f) {
        send(ctx, req, response(HttpResponseStatus.OK, EventJson.object(f) + "\n", "application/json"));
    }

    private static void number(JsonGenerator g, String name, double v) throws IOException {
        if (Double.isNaN(v)) {
            g.writeNullField(name);
        } else {
            g.writeNumberField(name, Math.round(v * 10000) / 10000.0);
        }
    }

    private void cameras(JsonGenerator g) throws IOException {
        g.writeArrayFieldStart("cameras");
        for (CameraPipeline p : shared.service().pipelines()) {
            g.writeStartObject();
            g.writeStringField("id", p.id());
            g.writeStringField("source", ConfigPrinter.maskUrl(p.config().source()));
            g.writeBooleanField("delivering", p.delivering());
            g.writeNumberField("frames_in", p.framesIn());
            g.writeNumberField("frames_analysed", p.analysedFrames());
            g.writeNumberField("frames_dropped", p.droppedFrames());
            g.writeNumberField("decode_errors", p.decodeErrors());
            g.writeNumberField("reconnects", p.reconnects());
            number(g, "stream_s", p.streamSeconds());
            g.writeArrayFieldStart("zones");
            List<ZoneConfig> zones = p.config().zones();
            for (int z = 0; z < zones.size(); z++) {
                ZoneConfig zc = zones.get(z);
                g.writeStartObject();
                g.writeStringField("id", zc.id());
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
                number(g, "coverage", p.zoneCoverage(z));
                number(g, "against", p.zoneAgainst(z));
                g.writeNumberField("events", p.zoneEvents(z));
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        }
        g.writeEndArray();
    }

    private void events(ChannelHandlerContext ctx, FullHttpRequest req, QueryStringDecoder q) {
        int limit = 50;
        List<String> l = q.parameters().get("limit");
        if (l != null && !l.isEmpty()) {
            try {
                limit = Integer.parseInt(l.get(0));
            } catch (NumberFormatException e) {
                limit = -1;
            }
            if (limit < 1 || limit > 200) {
                text(ctx, req, HttpResponseStatus.BAD_REQUEST, "limit: a whole number from 1 to 200\n", false);
                return;
            }
        }
        StringBuilder b = new StringBuilder("{\"events\":[");
        List<Event> last = shared.service().recentEvents().last(limit);
        for (int i = 0; i < last.size(); i++) {
            b.append(i == 0 ? "" : ",").append(EventJson.toJson(last.get(i)));
        }
        b.append("]}\n");
        send(ctx, req, response(HttpResponseStatus.OK, b.toString(), "application/json"));
    }

    private Path clipsDir() {
        return shared.service().config().dataDir().resolve("clips").toAbsolutePath().normalize();
    }

    private void clips(JsonGenerator g) throws IOException {
        Path dir = clipsDir();
        g.writeArrayFieldStart("clips");
        if (Files.isDirectory(dir)) {
            List<Path> files;
            try (Stream<Path> s = Files.walk(dir)) {
                files = s.filter(p -> Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS) && servable(p)).sorted().toList();
            }
            for (Path p : files) {
                g.writeStartObject();
                String rel = dir.relativize(p).toString().replace('\\', '/');
                g.writeStringField("path", "clips/" + rel);
                g.writeStringField("url", "/clips/" + rel);
                g.writeNumberField("bytes", Files.size(p));
                g.writeStringField("modified", DateTimeFormatter.ISO_INSTANT.format(Files.getLastModifiedTime(p).toInstant()));
                g.writeEndObject();
            }
        }
        g.writeEndArray();
    }

    private static boolean servable(Path p) {
        String n = p.getFileName().toString().toLowerCase(Locale.ROOT);
        return n.endsWith(".mp4") || n.endsWith(".jpg") || n.endsWith(".json");
    }

    private static String typeOf(Path p) {
        String n = p.getFileName().toString().toLowerCase(Locale.ROOT);
        return n.endsWith(".mp4") ? "video/mp4" : n.endsWith(".jpg") ? "image/jpeg" : "application/json";
    }

    /** A clip, snapshot or sidecar below the clips folder, never anything else; single byte ranges. */
    private void clip(ChannelHandlerContext ctx, FullHttpRequest req, String raw) throws IOException {
        String rel;
        try {
            rel = QueryStringDecoder.decodeComponent(raw, StandardCharsets.UTF_8);
        } catch (IllegalArgumentException e) {
            text(ctx, req, HttpResponseStatus.BAD_REQUEST, "malformed path\n", false);
            return;
        }
        if (rel.isEmpty() || rel.contains("\0") || rel.contains("\\") || rel.startsWith("/") || rel.contains("..")) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such clip\n", false);
            return;
        }
        Path dir = clipsDir();
        Path file = dir.resolve(rel).normalize();
        if (!file.startsWith(dir) || !servable(file)) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such clip\n", false);
            return;
        }
        if (!Files.isRegularFile(file, LinkOption.NOFOLLOW_LINKS)
                || !file.toRealPath().startsWith(dir.toRealPath())) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such clip\n", false);
            return;
        }
        long size = Files.size(file);
        long from = 0;
        long to = size - 1;
        boolean partial = false;
        String range = req.headers().get(HttpHeaderNames.RANGE);
        if (range != null) {
            long[] r = parseRange(range, size);
            if (r == null) {
                FullHttpResponse bad = response(HttpResponseStatus.REQUESTED_RANGE_NOT_SATISFIABLE,
                        "range not satisfiable (one range of bytes within " + size + ")\n", "text/plain");
                bad.headers().set(HttpHeaderNames.CONTENT_RANGE, "bytes */" + size);
                send(ctx, req, bad);
                return;
            }
            from = r[0];
            to = r[1];
            partial = true;
        }
        HttpResponse r = new DefaultHttpResponse(HttpVersion.HTTP_1_1,
                partial ? HttpResponseStatus.PARTIAL_CONTENT : HttpResponseStatus.OK);
        r.headers().set(HttpHeaderNames.CONTENT_TYPE, typeOf(file));
        r.headers().set(HttpHeaderNames.ACCEPT_RANGES, HttpHeaderValues.BYTES);
        r.headers().set(HttpHeaderNames.CONTENT_LENGTH, to - from + 1);
        if (partial) {
            r.headers().set(HttpHeaderNames.CONTENT_RANGE, "bytes " + from + "-" + to + "/" + size);
        }
        boolean keepAlive = HttpUtil.isKeepAlive(req);
        if (keepAlive) {
            r.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.KEEP_ALIVE);
        }
        ctx.write(r);
        if (!req.method().equals(HttpMethod.HEAD) && to >= from) {
            RandomAccessFile f = new RandomAccessFile(file.toFile(), "r");
            ctx.write(new DefaultFileRegion(f.getChannel(), from, to - from + 1));
        }
        ChannelFuture done = ctx.writeAndFlush(LastHttpContent.EMPTY_LAST_CONTENT);
        if (!keepAlive) {
            done.addListener(ChannelFutureListener.CLOSE);
        }
    }

    /** One range "bytes=a-b", "bytes=a-" or "bytes=-n" (RFC 9110 §14.1.2), clipped to the size; else null. */
    static long[] parseRange(String header, long size) {
        if (!header.startsWith("bytes=") || header.indexOf(',') >= 0 || size == 0) {
            return null;
        }
        String spec = header.substring(6).trim();
        int dash = spec.indexOf('-');
        if (dash < 0) {
            return null;
        }
        try {
            String a = spec.substring(0, dash).trim();
            String b = spec.substring(dash + 1).trim();
            long from;
            long to;
            if (a.isEmpty()) {
                long n = Long.parseLong(b);
                if (n <= 0) {
                    return null;
                }
                from = Math.max(0, size - n);
                to = size - 1;
            } else {
                from = Long.parseLong(a);
                to = b.isEmpty() ? size - 1 : Math.min(Long.parseLong(b), size - 1);
            }
            return from >= 0 && from < size && from <= to ? new long[] {from, to} : null;
        } catch (NumberFormatException e) {
            return null;
        }
    }

    private static FullHttpResponse response(HttpResponseStatus status, String body, String type) {
        ByteBuf content = Unpooled.copiedBuffer(body, StandardCharsets.UTF_8);
        FullHttpResponse r = new DefaultFullHttpResponse(HttpVersion.HTTP_1_1, status, content);
        r.headers().set(HttpHeaderNames.CONTENT_TYPE, type);
        r.headers().set(HttpHeaderNames.CONTENT_LENGTH, content.readableBytes());
        r.headers().set(HttpHeaderNames.CACHE_CONTROL, "no-store");
        return r;
    }

    private static void text(ChannelHandlerContext ctx, FullHttpRequest req, HttpResponseStatus s, String body,
            boolean close) {
        FullHttpResponse r = response(s, body, "text/plain; charset=utf-8");
        if (close) {
            r.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.CLOSE);
            ctx.writeAndFlush(r).addListener(ChannelFutureListener.CLOSE);
            return;
        }
        send(ctx, req, r);
    }

    private static void send(ChannelHandlerContext ctx, FullHttpRequest req, FullHttpResponse r) {
        boolean keepAlive = HttpUtil.isKeepAlive(req);
        if (req.method().equals(HttpMethod.HEAD)) {
            r.content().clear();
        }
        if (keepAlive) {
            r.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.KEEP_ALIVE);
            ctx.writeAndFlush(r);
        } else {
            r.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.CLOSE);
            ctx.writeAndFlush(r).addListener(ChannelFutureListener.CLOSE);
        }
    }

    @Override
    public void userEventTriggered(ChannelHandlerContext ctx, Object evt) throws Exception {
        if (evt instanceof IdleStateEvent) {
            ctx.close();
            return;
        }
        super.userEventTriggered(ctx, evt);
    }

    @Override
    public void exceptionCaught(ChannelHandlerContext ctx, Throwable cause) {
        LOG.debug("status server: {}", cause.toString());
        ctx.close();
    }
}
