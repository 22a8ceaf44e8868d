package wayward.http;

import io.netty.channel.ChannelDuplexHandler;
import io.netty.channel.ChannelHandler;
import io.netty.channel.ChannelHandlerContext;
import io.netty.channel.ChannelInboundHandlerAdapter;
import io.netty.channel.ChannelPromise;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.LastHttpContent;
import io.netty.util.concurrent.ScheduledFuture;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;

/**
 * The status server's defences against clients that hold connections: a cap on connections served at once
 * ({@link Cap}, one per server) and a deadline for each request's line and headers ({@link HeaderDeadline}, one per
 * connection): a client that sends a header byte every few seconds is closed when the deadline passes, which the
 * idle timeout alone never did.
 */
final class ConnectionLimits {
    private ConnectionLimits() {
    }

    /** Closes a new connection at once when {@code max} are open already. Shared by all connections. */
    @ChannelHandler.Sharable
    static final class Cap extends ChannelInboundHandlerAdapter {
        private final int max;
        private final AtomicInteger open = new AtomicInteger();
        private final AtomicLong refused = new AtomicLong();

        Cap(int max) {
            this.max = max;
        }

        int open() {
            return open.get();
        }

        /** Connections closed at once because the cap was reached, since the start. */
        long refused() {
            return refused.get();
        }

        @Override
        public void channelActive(ChannelHandlerContext ctx) throws Exception {
            if (open.incrementAndGet() > max) {
                refused.incrementAndGet();
                ctx.close();
                return;
            }
            super.channelActive(ctx);
        }

        @Override
        public void channelInactive(ChannelHandlerContext ctx) throws Exception {
            open.decrementAndGet();
            super.channelInactive(ctx);
        }
    }

    /**
     * Closes the connection unless a whole request (line, headers, body) has arrived within the deadline after the
     * connection opened or the last answer was sent. Placed after the aggregator, so it sees whole requests.
     */
    static final class HeaderDeadline extends ChannelDuplexHandler {
        private final long seconds;
        private ScheduledFuture<?> timer;

        HeaderDeadline(long seconds) {
            this.seconds = seconds;
        }

        @Override
        public void channelActive(ChannelHandlerContext ctx) throws Exception {
            arm(ctx);
            super.channelActive(ctx);
        }

        @Override
        public void channelRead(ChannelHandlerContext ctx, Object msg) throws Exception {
            if (msg instanceof FullHttpRequest) {
                disarm();
            }
            super.channelRead(ctx, msg);
        }

        @Override
        public void write(ChannelHandlerContext ctx, Object msg, ChannelPromise promise) throws Exception {
            if (msg instanceof LastHttpContent) {
                // the answer is complete: the next request on this connection has its own deadline
                promise.addListener(f -> {
                    if (ctx.channel().isActive()) {
                        arm(ctx);
                    }
                });
            }
            super.write(ctx, msg, promise);
        }

        @Override
        public void channelInactive(ChannelHandlerContext ctx) throws Exception {
            disarm();
            super.channelInactive(ctx);
        }

        private void arm(ChannelHandlerContext ctx) {
            disarm();
            timer = ctx.executor().schedule(() -> {
                ctx.close();
            }, seconds, TimeUnit.SECONDS);
        }

        private void disarm() {
            if (timer != null) {
                timer.cancel(false);
                timer = null;
            }
        }
    }
}
