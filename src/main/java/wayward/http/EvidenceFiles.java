package wayward.http;

import static wayward.http.Replies.response;
import static wayward.http.Replies.send;
import static wayward.http.Replies.text;

import io.netty.channel.ChannelFuture;
import io.netty.channel.ChannelFutureListener;
import io.netty.channel.ChannelHandlerContext;
import io.netty.channel.DefaultFileRegion;
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
import java.io.IOException;
import java.io.RandomAccessFile;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.time.format.DateTimeFormatter;
import java.util.List;
import java.util.Locale;
import java.util.function.Supplier;
import java.util.stream.Stream;
import wayward.clip.EvidenceFolder;
import wayward.event.EventJson;

/**
 * The evidence below the evidence folder: {@code /api/evidence} lists it, {@code /evidence/<path>} serves one
 * clip, snapshot or sidecar (single byte ranges), never anything outside the folder (no {@code ..}, no symbolic link
 * out, only .mp4, .jpg and .json).
 */
final class EvidenceFiles {
    /** Files listed in one answer of /api/evidence by default, and at most (?limit=). */
    static final int DEFAULT_PAGE = 100;
    static final int MAX_PAGE = 1000;

    private final Supplier<Path> folder;

    /** @param folder the evidence folder (read at each request: a reload may move it) */
    EvidenceFiles(Supplier<Path> folder) {
        this.folder = folder;
    }

    private Path dir() {
        return folder.get().toAbsolutePath().normalize();
    }

    /**
     * {@code /api/evidence?offset=M&limit=N}: the total of servable files and one page of them, sorted, each with
     * its path (relative to the data folder, as event records name it), URL, size and modification time.
     */
    void list(ChannelHandlerContext ctx, FullHttpRequest req, QueryStringDecoder q) throws IOException {
        Integer limit = Replies.whole(ctx, req, q, "limit", DEFAULT_PAGE, 1, MAX_PAGE);
        Integer offset = limit == null ? null : Replies.whole(ctx, req, q, "offset", 0, 0, Integer.MAX_VALUE);
        if (offset == null) {
            return;
        }
        Path dir = dir();
        List<Path> files = List.of();
        if (Files.isDirectory(dir)) {
            try (Stream<Path> s = Files.walk(dir)) {
                files = s.filter(p -> Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS) && servable(p)).sorted()
                        .toList();
            }
        }
        List<Path> all = files;
        List<Path> page = all.subList(Math.min(offset, all.size()), (int) Math.min(all.size(), (long) offset + limit));
        String body = EventJson.object(g -> {
            g.writeNumberField("total", all.size());
            g.writeNumberField("offset", offset);
            g.writeArrayFieldStart("files");
            for (Path p : page) {
                g.writeStartObject();
                String rel = dir.relativize(p).toString().replace('\\', '/');
                g.writeStringField("path", EvidenceFolder.NAME + "/" + rel);
                g.writeStringField("url", "/" + EvidenceFolder.NAME + "/" + rel);
                g.writeNumberField("bytes", Files.size(p));
                g.writeStringField("modified",
                        DateTimeFormatter.ISO_INSTANT.format(Files.getLastModifiedTime(p).toInstant()));
                g.writeEndObject();
            }
            g.writeEndArray();
        });
        Replies.json(ctx, req, HttpResponseStatus.OK, body);
    }

    static boolean servable(Path p) {
        String n = p.getFileName().toString().toLowerCase(Locale.ROOT);
        return n.endsWith(".mp4") || n.endsWith(".jpg") || n.endsWith(".json");
    }

    private static String typeOf(Path p) {
        String n = p.getFileName().toString().toLowerCase(Locale.ROOT);
        return n.endsWith(".mp4") ? "video/mp4" : n.endsWith(".jpg") ? "image/jpeg" : "application/json";
    }

    /** {@code /evidence/<raw>}: one file, whole or one byte range. */
    void serve(ChannelHandlerContext ctx, FullHttpRequest req, String raw) throws IOException {
        String rel;
        try {
            rel = QueryStringDecoder.decodeComponent(raw, StandardCharsets.UTF_8);
        } catch (IllegalArgumentException e) {
            text(ctx, req, HttpResponseStatus.BAD_REQUEST, "malformed path\n", false);
            return;
        }
        if (rel.isEmpty() || rel.contains("\0") || rel.contains("\\") || rel.startsWith("/") || rel.contains("..")) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such evidence file\n", false);
            return;
        }
        Path dir = dir();
        Path file = dir.resolve(rel).normalize();
        if (!file.startsWith(dir) || !servable(file)) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such evidence file\n", false);
            return;
        }
        if (!Files.isRegularFile(file, LinkOption.NOFOLLOW_LINKS)
                || !file.toRealPath().startsWith(dir.toRealPath())) {
            text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such evidence file\n", false);
            return;
        }
        long size = Files.size(file);
        long from = 0;
        long to = size - 1;
        boolean partial = false;
        String range = req.headers().get(HttpHeaderNames.RANGE);
        if (range != null) {
            Range r = parseRange(range, size);
            if (r == null) {
                FullHttpResponse bad = response(HttpResponseStatus.REQUESTED_RANGE_NOT_SATISFIABLE,
                        "range not satisfiable (one range of bytes within " + size + ")\n", "text/plain");
                bad.headers().set(HttpHeaderNames.CONTENT_RANGE, "bytes */" + size);
                send(ctx, req, bad);
                return;
            }
            from = r.first();
            to = r.last();
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

    /** A byte range of a file, first and last byte included. */
    record Range(long first, long last) {
    }

    /** One range "bytes=a-b", "bytes=a-" or "bytes=-n" (RFC 9110 §14.1.2), clipped to the size; else null. */
    static Range parseRange(String header, long size) {
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
            return from >= 0 && from < size && from <= to ? new Range(from, to) : null;
        } catch (NumberFormatException e) {
            return null;
        }
    }
}
