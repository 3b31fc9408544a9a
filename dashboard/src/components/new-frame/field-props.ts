import type { InputHTMLAttributes } from 'vue'
import type { FieldMessage } from '../../utils/field-messages'

/** naive-ui NFormItem props for the message of one field path (none when the field is fine). */
export function feedbackProps(messages: Record<string, FieldMessage>, path: string) {
  const m = messages[path]
  return m ? { feedback: m.message, validationStatus: m.status } : {}
}

/**
 * Attributes for a naive-ui input's inner <input> (its `input-props`), including `data-test`
 * and `aria-*`, which Vue's attribute types do not list.
 */
export function ip(attrs: Record<string, string>): InputHTMLAttributes {
  return attrs as InputHTMLAttributes
}
