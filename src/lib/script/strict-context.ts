/**
 * A read-only view of the render context that throws on any field it does not have.
 * Handlebars' own `strict` mode only covers plain `{{name}}` output, not helper
 * arguments or `{{#if}}` conditions; this view makes every misspelt or missing field
 * an error wherever the template reads it.
 */

/** Raised when a template reads a field the render context does not have. */
export class MissingFieldError extends Error {
	readonly fieldPath: string;
	readonly key: string;
	constructor(parentPath: string, key: string) {
		const fieldPath = /^\d+$/.test(key) ? `${parentPath}[${key}]` : parentPath === '' ? key : `${parentPath}.${key}`;
		super(`the template reads "${fieldPath}", which the render context does not have`);
		this.name = 'MissingFieldError';
		this.fieldPath = fieldPath;
		this.key = key;
	}
}

/** Wraps `value` (recursively, lazily) so that reading an absent field throws MissingFieldError. */
export function createStrictView<T>(value: T): T {
	const views = new WeakMap<object, unknown>();

	function wrap(target: unknown, path: string): unknown {
		if (target === null || typeof target !== 'object') return target;
		const known = views.get(target);
		if (known !== undefined) return known;
		const view = new Proxy(target, {
			get(obj, key, receiver) {
				if (typeof key === 'symbol' || key in obj) {
					const field: unknown = Reflect.get(obj, key, receiver);
					if (typeof key === 'symbol' || !Object.prototype.hasOwnProperty.call(obj, key)) return field;
					return wrap(field, /^\d+$/.test(key) ? `${path}[${key}]` : path === '' ? key : `${path}.${key}`);
				}
				throw new MissingFieldError(path, key);
			},
			set() {
				throw new TypeError('the render context is read-only');
			},
			deleteProperty() {
				throw new TypeError('the render context is read-only');
			}
		});
		views.set(target, view);
		return view;
	}

	return wrap(value, '') as T;
}
