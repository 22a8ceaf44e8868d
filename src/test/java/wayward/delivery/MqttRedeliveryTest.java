package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.netty.bootstrap.ServerBootstrap;
import io.netty.channel.Channel;
import io.netty.channel.ChannelHandlerContext;
import io.netty.channel.ChannelInitializer;
import io.netty.channel.EventLoopGroup;
import io.netty.channel.MultiThreadIoEventLoopGroup;
import io.netty.channel.SimpleChannelInboundHandler;
import io.netty.channel.nio.NioIoHandler;
import io.netty.channel.socket.SocketChannel;
import io.netty.channel.socket.nio.NioServerSocketChannel;
import io.netty.handler.codec.mqtt.MqttConnectMessage;
import io.netty.handler.codec.mqtt.MqttConnectReturnCode;
import io.netty.handler.codec.mqtt.MqttDecoder;
import io.netty.handler.codec.mqtt.MqttEncoder;
import io.netty.handler.codec.mqtt.MqttMessage;
import io.netty.handler.codec.mqtt.MqttMessageBuilders;
import io.netty.handler.codec.mqtt.MqttMessageType;
import io.netty.handler.codec.mqtt.MqttPublishMessage;
import java.net.InetSocketAddress;
import java.time.Instant;
import java.util.List;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import wayward.event.Event;
import wayward.event.EventKind;

/**
 * Redelivery as MQTT 3.1.1 §4.4 requires: a broker written for this test accepts the first connection, takes
 * a PUBLISH without acknowledging it and drops the connection; after the reconnect the same message must come
 * again with its original packet identifier and the DUP flag set (§3.3.1.1), and the CONNECT must ask to keep
 * the session (clean session 0, §3.1.2.4) and carry the retained will.
 */
@Timeout(value = 30, unit = TimeUnit.SECONDS)
class MqttRedeliveryTest {
    private record Seen(int connection, String type, String topic, int packetId, boolean dup, boolean retain) {
    }

    @Test
    void anUnacknowledgedPublishComesAgainWithDupAndItsPacketId() throws Exception {
        BlockingQueue<Seen> seen = new LinkedBlockingQueue<>();
        BlockingQueue<MqttConnectMessage> connects = new LinkedBlockingQueue<>();
        AtomicInteger connections = new AtomicInteger();
        EventLoopGroup group = new MultiThreadIoEventLoopGroup(1, NioIoHandler.newFactory());
        try {
            Channel server = new ServerBootstrap().group(group).channel(NioServerSocketChannel.class)
                    .childHandler(new ChannelInitializer<SocketChannel>() {
                        @Override
                        protected void initChannel(SocketChannel ch) {
                            int n = connections.incrementAndGet();
                            ch.pipeline().addLast(new MqttDecoder(), MqttEncoder.INSTANCE,
                                    new SimpleChannelInboundHandler<MqttMessage>() {
                                        @Override
                                        protected void channelRead0(ChannelHandlerContext ctx, MqttMessage m) {
                                            MqttMessageType t = m.fixedHeader().messageType();
                                            if (t == MqttMessageType.CONNECT) {
                                                connects.add((MqttConnectMessage) m);
                                                ctx.writeAndFlush(MqttMessageBuilders.connAck()
                                                        .returnCode(MqttConnectReturnCode.CONNECTION_ACCEPTED)
                                                        .sessionPresent(n > 1).build());
                                            } else if (t == MqttMessageType.PUBLISH) {
                                                MqttPublishMessage p = (MqttPublishMessage) m;
                                                seen.add(new Seen(n, "PUBLISH", p.variableHeader().topicName(),
                                                        p.variableHeader().packetId(), p.fixedHeader().isDup(),
                                                        p.fixedHeader().isRetain()));
                                                if (n == 1) {
                                                    ctx.close(); // gone before the PUBACK
                                                } else {
                                                    ctx.writeAndFlush(MqttMessageBuilders.pubAck()
                                                            .packetId(p.variableHeader().packetId()).build());
                                                }
                                            }
                                        }
                                    });
                        }
                    }).bind(new InetSocketAddress("127.0.0.1", 0)).sync().channel();
            int port = ((InetSocketAddress) server.localAddress()).getPort();
            MqttConfig config = new MqttConfig("mqtt://127.0.0.1:" + port, "yard", "wayward-redeliver", null, null,
                    null, 30, null, 1, 1, null, false);
            MqttPublisher p = new MqttPublisher(config, List.of(), 1);
            Event e = new Event("r1", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY, Event.Phase.START, 1,
                    Instant.parse("2026-12-02T10:00:00Z"), 180, 40, 0.05, Double.NaN);
            CompletableFuture<Destination.Result> answer = p.send(1, e);
            Seen first = seen.poll(10, TimeUnit.SECONDS);
            assertEquals("yard/yard-mast-2/lane-2-out/event", first.topic());
            assertFalse(first.dup(), "first transmission");
            assertEquals(Destination.Status.DELIVERED, answer.get(20, TimeUnit.SECONDS).status());
            Seen again = null;
            for (Seen s; (s = seen.poll(1, TimeUnit.SECONDS)) != null; ) {
                if (s.connection() == 2 && s.topic().equals(first.topic())) {
                    again = s;
                }
            }
            assertTrue(again != null, "sent again after reconnecting");
            assertTrue(again.dup(), "DUP flag on the retransmission");
            assertEquals(first.packetId(), again.packetId(), "original packet identifier");
            MqttConnectMessage c = connects.poll(1, TimeUnit.SECONDS);
            assertFalse(c.variableHeader().isCleanSession(), "the session is kept");
            assertTrue(c.variableHeader().isWillFlag() && c.variableHeader().isWillRetain());
            assertEquals("yard/status/wayward-redeliver", c.payload().willTopic());
            p.close();
            server.close().sync();
        } finally {
            group.shutdownGracefully(0, 1, TimeUnit.SECONDS).sync();
        }
    }
}
