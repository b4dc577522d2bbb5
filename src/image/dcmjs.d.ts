/** The small part of dcmjs 0.51 (no bundled types) that the DICOM writer uses. */
declare module 'dcmjs' {
	interface DicomDictInstance {
		dict: Record<string, unknown>;
		write(options?: Record<string, unknown>): ArrayBuffer;
	}
	const dcmjs: {
		data: {
			DicomMetaDictionary: {
				denaturalizeDataset(dataset: Record<string, unknown>): Record<string, unknown>;
			};
			DicomDict: new (meta: Record<string, unknown>) => DicomDictInstance;
		};
	};
	export default dcmjs;
}
