package wayward.http;

import io.netty.buffer.ByteBuf;
import io.netty.buffer.Unpooled;
import io.netty.channel.ChannelFutureListener;
import io.netty.channel.ChannelHandlerContext;
import io.netty.handler.codec.http.DefaultHttpContent;
import io.netty.handler.codec.http.DefaultHttpResponse;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.HttpHeaderNames;
import io.netty.handler.codec.http.HttpHeaderValues;
import io.netty.handler.codec.http.HttpResponse;
import io.netty.handler.codec.http.HttpResponseStatus;
import io.netty.handler.codec.http.HttpVersion;
import io.netty.util.concurrent.ScheduledFuture;
import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.TimeUnit;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicInteger;
import javax.imageio.ImageIO;
import wayward.analysis.ZoneConfig;
import wayward.analysis.CameraStatus;

/**
 * The live view as MJPEG over HTTP (multipart/x-mixed-replace, one JPEG per part): the analysis frame with
 * zones, headings and flow arrows, up to 5 pictures a second, only new ones, and none while the client is not
 * reading (the channel is not writable). Runs on the connection's event loop until the client goes.
 */
final class LiveStream {
    static final String BOUNDARY = "waywardframe";
    /** MJPEG viewers served at once, all cameras together; more are answered 503. */
    static final int MAX_VIEWERS = 16;

    /** The last picture encoded per camera, with the live copy it was made from: each copy is encoded once. */
    private record Encoded(long copy, byte[] jpeg) {
    }

    private static final Map<String, Encoded> LAST = new ConcurrentHashMap<>();
    private static final AtomicInteger VIEWERS = new AtomicInteger();

    private LiveStream() {
    }

    /**
     * The current live picture as JPEG, or null before the first one; encoded once per live copy, however many
     * viewers and picture requests ask for it.
     */
    static byte[] jpeg(CameraStatus p) throws IOException {
        long copy = p.live().copies();
        Encoded last = LAST.get(p.id());
        if (last != null && last.copy() == copy) {
            return last.jpeg();
        }
        byte[] jpg = encode(p);
        if (jpg != null) {
            LAST.put(p.id(), new Encoded(copy, jpg));
        }
        return jpg;
    }

    private static byte[] encode(CameraStatus p) throws IOException {
        double minStep = ZoneConfig.DEFAULT_MIN_SPEED / p.config().analysisFps();
        double[] headings = new double[p.config().zones().size()];
        for (int z = 0; z < headings.length; z++) {
            headings[z] = p.zoneHeading(z);
        }
        BufferedImage img = p.live().render(p.config().zones(), headings, minStep);
        if (img == null) {
            return null;
        }
        ByteArrayOutputStream out = new ByteArrayOutputStream(64 * 1024);
        ImageIO.write(img, "jpg", out);
        return out.toByteArray();
    }

    static void start(ChannelHandlerContext ctx, FullHttpRequest req, CameraStatus p) {
        if (p == null) {
            ctx.writeAndFlush(new io.netty.handler.codec.http.DefaultFullHttpResponse(HttpVersion.HTTP_1_1,
                    HttpResponseStatus.NOT_FOUND, Unpooled.copiedBuffer("no such camera\n", StandardCharsets.UTF_8)))
                    .addListener(ChannelFutureListener.CLOSE);
            return;
        }
        if (VIEWERS.incrementAndGet() > MAX_VIEWERS) {
            VIEWERS.decrementAndGet();
            io.netty.handler.codec.http.FullHttpResponse busy = new io.netty.handler.codec.http.DefaultFullHttpResponse(
                    HttpVersion.HTTP_1_1, HttpResponseStatus.SERVICE_UNAVAILABLE, Unpooled.copiedBuffer(
                            "too many live viewers (" + MAX_VIEWERS + "); try again later\n", StandardCharsets.UTF_8));
            busy.headers().set(HttpHeaderNames.RETRY_AFTER, "10");
            ctx.writeAndFlush(busy).addListener(ChannelFutureListener.CLOSE);
            return;
        }
        ctx.channel().closeFuture().addListener(f -> VIEWERS.decrementAndGet());
        HttpResponse r = new DefaultHttpResponse(HttpVersion.HTTP_1_1, HttpResponseStatus.OK);
        r.headers().set(HttpHeaderNames.CONTENT_TYPE, "multipart/x-mixed-replace; boundary=" + BOUNDARY);
        r.headers().set(HttpHeaderNames.TRANSFER_ENCODING, HttpHeaderValues.CHUNKED);
        r.headers().set(HttpHeaderNames.CACHE_CONTROL, "no-store");
        r.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.CLOSE);
        ctx.writeAndFlush(r);
        long[] sent = {-1};
        ScheduledFuture<?> task = ctx.executor().scheduleAtFixedRate(() -> {
            p.live().want();
            long copies = p.live().copies();
            if (!ctx.channel().isActive() || !ctx.channel().isWritable() || copies == sent[0]) {
                return;
            }
            try {
                byte[] jpg = jpeg(p);
                if (jpg == null) {
                    return;
                }
                sent[0] = copies;
                byte[] head = ("--" + BOUNDARY + "\r\nContent-Type: image/jpeg\r\nContent-Length: " + jpg.length
                        + "\r\n\r\n").getBytes(StandardCharsets.US_ASCII);
                ByteBuf part = Unpooled.wrappedBuffer(head, jpg, "\r\n".getBytes(StandardCharsets.US_ASCII));
                ctx.writeAndFlush(new DefaultHttpContent(part));
            } catch (IOException | RuntimeException e) {
                ctx.close();
            }
        }, 0, 200, TimeUnit.MILLISECONDS);
        ctx.channel().closeFuture().addListener(f -> task.cancel(false));
    }
}
