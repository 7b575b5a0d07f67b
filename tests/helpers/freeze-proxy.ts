import net from 'node:net';

export interface FreezeProxy {
	port: number;
	/** From now on bytes from clients are swallowed: the service looks alive (it accepts) but never answers. */
	freeze: () => void;
	thaw: () => void;
	close: () => Promise<void>;
}

/** A TCP relay to a service on loopback that can freeze it, as a hung host would. */
export async function startFreezeProxy(targetPort: number): Promise<FreezeProxy> {
	let frozen = false;
	const sockets = new Set<net.Socket>();
	const server = net.createServer((client) => {
		sockets.add(client);
		const upstream = net.connect(targetPort, '127.0.0.1');
		sockets.add(upstream);
		client.on('data', (chunk) => {
			if (!frozen) upstream.write(chunk);
		});
		upstream.on('data', (chunk) => {
			if (!frozen) client.write(chunk);
		});
		const end = () => {
			client.destroy();
			upstream.destroy();
			sockets.delete(client);
			sockets.delete(upstream);
		};
		client.on('close', end).on('error', end);
		upstream.on('close', end).on('error', end);
	});
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	return {
		port: (server.address() as net.AddressInfo).port,
		freeze: () => void (frozen = true),
		thaw: () => void (frozen = false),
		close: () =>
			new Promise<void>((resolve) => {
				for (const s of sockets) s.destroy();
				server.close(() => resolve());
			}),
	};
}
