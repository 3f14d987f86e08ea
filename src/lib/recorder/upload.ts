/** PUTs a file with progress (fetch has no upload progress; XMLHttpRequest does). */
export function uploadAudio(url: string, file: Blob, onProgress: (fraction: number) => void): Promise<void> {
	return new Promise((resolve, reject) => {
		const xhr = new XMLHttpRequest();
		xhr.open('PUT', url);
		xhr.setRequestHeader('content-type', file.type || 'audio/webm');
		xhr.upload.onprogress = (e) => e.lengthComputable && onProgress(e.loaded / e.total);
		xhr.onload = () => {
			if (xhr.status >= 200 && xhr.status < 300) return resolve();
			let message = `the server answered ${xhr.status}`;
			try {
				message = JSON.parse(xhr.responseText).error ?? message;
			} catch {
				/* keep the status line */
			}
			reject(new Error(message));
		};
		xhr.onerror = () => reject(new Error('the server cannot be reached'));
		xhr.send(file);
	});
}
